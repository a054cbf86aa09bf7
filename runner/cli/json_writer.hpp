// JsonWriter: a small streaming JSON writer for machine-readable output (design results, later
// manifests). Numbers print with 17 significant digits; non-finite numbers print as null.
#pragma once

#include <Eigen/Dense>

#include <cmath>
#include <complex>
#include <cstdio>
#include <string>
#include <string_view>
#include <vector>

namespace upright::cli {

class JsonWriter {
 public:
  void BeginObject(std::string_view key = {}) { Open(key, '{'); }
  void EndObject() { Close('}'); }
  void BeginArray(std::string_view key = {}) { Open(key, '['); }
  void EndArray() { Close(']'); }

  void Number(std::string_view key, double value) {
    Key(key);
    if (!std::isfinite(value)) {
      out_ += "null";
      return;
    }
    char buffer[32];
    std::snprintf(buffer, sizeof buffer, "%.17g", value);
    out_ += buffer;
  }
  void String(std::string_view key, std::string_view value) {
    Key(key);
    Quoted(value);
  }
  void Bool(std::string_view key, bool value) {
    Key(key);
    out_ += value ? "true" : "false";
  }
  // A matrix as row-major nested arrays.
  void Matrix(std::string_view key, const Eigen::MatrixXd& m) {
    BeginArray(key);
    for (Eigen::Index i = 0; i < m.rows(); ++i) {
      BeginArray();
      for (Eigen::Index j = 0; j < m.cols(); ++j) Number({}, m(i, j));
      EndArray();
    }
    EndArray();
  }
  // Complex numbers as [re, im] pairs.
  void ComplexList(std::string_view key, const std::vector<std::complex<double>>& values) {
    BeginArray(key);
    for (const auto& v : values) {
      BeginArray();
      Number({}, v.real());
      Number({}, v.imag());
      EndArray();
    }
    EndArray();
  }
  const std::string& text() const { return out_; }

 private:
  // Starts a value: the comma before it, and its key inside an object.
  void Key(std::string_view key) {
    if (need_comma_) out_ += ',';
    need_comma_ = true;
    if (!key.empty()) {
      Quoted(key);
      out_ += ':';
    }
  }
  void Quoted(std::string_view text) {
    out_ += '"';
    for (char c : text) {
      if (c == '"' || c == '\\') {
        out_ += '\\';
        out_ += c;
      } else if (static_cast<unsigned char>(c) < 0x20) {
        char buffer[8];
        std::snprintf(buffer, sizeof buffer, "\\u%04x", c);
        out_ += buffer;
      } else {
        out_ += c;
      }
    }
    out_ += '"';
  }
  void Open(std::string_view key, char bracket) {
    Key(key);
    out_ += bracket;
    need_comma_ = false;
  }
  void Close(char bracket) {
    out_ += bracket;
    need_comma_ = true;
  }
  std::string out_;
  bool need_comma_ = false;
};

}  // namespace upright::cli
