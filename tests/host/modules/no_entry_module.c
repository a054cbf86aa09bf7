/* A shared object that is not a controller module: it exports no entry symbol. */
int upright_something_else(void) { return 42; }
