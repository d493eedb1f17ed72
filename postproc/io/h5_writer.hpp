// A small RAII writer for HDF5 files: datasets of numbers or strings, created with their parent
// groups, each carrying a "units" attribute; the root carries "format_version".
#pragma once

#include <hdf5.h>

#include <string>
#include <vector>

namespace oxystrat {

//! Version of the layout and units of every file oxystrat writes, the root attribute
//! `format_version`. 2.0: every dataset SI, one name per quantity (docs/outputs.md, CHANGELOG).
inline constexpr const char* kH5FormatVersion = "2.0";

class H5Writer {
 public:
  //! Creates (truncates) the file and marks its root with `format_version`.
  explicit H5Writer(const std::string& path);
  ~H5Writer();
  H5Writer(const H5Writer&) = delete;
  H5Writer& operator=(const H5Writer&) = delete;

  void write(const std::string& path, const std::vector<double>& data, const std::string& units);
  void write(const std::string& path, const std::vector<int>& data, const std::string& units);
  //! 2-D row-major array rows x cols.
  void write(const std::string& path, const std::vector<double>& data, size_t rows, size_t cols,
             const std::string& units);
  void write(const std::string& path, double value, const std::string& units);
  void write(const std::string& path, const std::string& text);
  void write(const std::string& path, const std::vector<std::string>& texts, const std::string& units = "1");
  //! String attribute on an existing object (dataset or group) or on "/".
  void attribute(const std::string& object, const std::string& name, const std::string& value);
  //! Integer-array attribute on an existing object.
  void attribute(const std::string& object, const std::string& name, const std::vector<int>& values);
  //! Closes the file; errors surface here rather than in the destructor.
  void close();
  //! Puts every following path under `group` (e.g. "/cases/pilot"); "" for the file root.
  void set_prefix(const std::string& group) { prefix_ = group; }

 private:
  hid_t file_ = -1;
  hid_t link_props_ = -1;
  std::string path_;
  std::string prefix_;
  std::string full(const std::string& path) const { return prefix_ + path; }
  void write_numeric(const std::string& path, hid_t type, const void* data, int rank, const hsize_t* dims,
                     const std::string& units);
};

}  // namespace oxystrat
