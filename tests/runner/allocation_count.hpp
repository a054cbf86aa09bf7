// Every allocation a test program makes through operator new, counted, so that a test can show
// that a piece of code makes none. A test executable that includes this links
// allocation_count.cpp, which replaces the global operator new and delete.
#pragma once

namespace upright::runner::testing {

// Allocations through operator new so far, in every thread of the program.
long AllocationCount();

}  // namespace upright::runner::testing
