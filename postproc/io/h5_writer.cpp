#include "postproc/io/h5_writer.hpp"
#include "input/errors.hpp"

#include <cerrno>
#include <cstring>
#include <stdexcept>

namespace oxystrat {
namespace {

void check(herr_t status, const std::string& what) {
  if (status < 0) throw IoError("HDF5: cannot " + what);
}

// A call that writes to the disk, with errno cleared before it: the system's reason when it
// failed ("No space left on device").
void check_io(herr_t status, const std::string& what) {
  if (status < 0) throw IoError("HDF5: cannot " + what + (errno != 0 ? std::string(": ") + std::strerror(errno) : ""));
}

hid_t checked(hid_t id, const std::string& what) {
  if (id < 0) throw IoError("HDF5: cannot " + what);
  return id;
}

// A variable-length UTF-8 string type; caller closes it.
hid_t string_type() {
  const hid_t t = H5Tcopy(H5T_C_S1);
  H5Tset_size(t, H5T_VARIABLE);
  H5Tset_cset(t, H5T_CSET_UTF8);
  return t;
}

void string_attribute(hid_t object, const std::string& name, const std::string& value) {
  const hid_t type = string_type();
  const hid_t space = H5Screate(H5S_SCALAR);
  const hid_t attr = checked(H5Acreate2(object, name.c_str(), type, space, H5P_DEFAULT, H5P_DEFAULT),
                             "create attribute " + name);
  const char* p = value.c_str();
  check(H5Awrite(attr, type, &p), "write attribute " + name);
  H5Aclose(attr);
  H5Sclose(space);
  H5Tclose(type);
}

}  // namespace

H5Writer::H5Writer(const std::string& path) : path_(path) {
  // A file whose close failed (a full disk) stays half-open inside the library, and HDF5's own
  // clean-up at exit then crashes on it: every file is closed here explicitly, so that clean-up is
  // not needed. Effective only before the library's first call; later calls change nothing.
  static const bool no_exit_cleanup = [] {
    H5dont_atexit();
    return true;
  }();
  (void)no_exit_cleanup;
  H5Eset_auto2(H5E_DEFAULT, nullptr, nullptr);  // we report errors ourselves
  file_ = checked(H5Fcreate(path.c_str(), H5F_ACC_TRUNC, H5P_DEFAULT, H5P_DEFAULT), "create " + path);
  link_props_ = H5Pcreate(H5P_LINK_CREATE);
  H5Pset_create_intermediate_group(link_props_, 1);
  // Here, once: no file of ours can be written without it.
  try {
    string_attribute(file_, "format_version", kH5FormatVersion);
  } catch (...) {
    H5Pclose(link_props_);  // the destructor does not run for a constructor that throws
    H5Fclose(file_);
    throw;
  }
}

H5Writer::~H5Writer() {
  if (link_props_ >= 0) H5Pclose(link_props_);
  if (file_ >= 0) H5Fclose(file_);
}

void H5Writer::close() {
  if (link_props_ >= 0) H5Pclose(link_props_);
  link_props_ = -1;
  if (file_ >= 0) {
    errno = 0;
    const herr_t s = H5Fclose(file_);
    file_ = -1;
    check_io(s, "close " + path_);
  }
}

void H5Writer::write_numeric(const std::string& path, hid_t type, const void* data, int rank, const hsize_t* dims,
                             const std::string& units) {
  const hid_t space = rank == 0 ? H5Screate(H5S_SCALAR) : H5Screate_simple(rank, dims, nullptr);
  const hid_t set = checked(H5Dcreate2(file_, full(path).c_str(), type, space, link_props_, H5P_DEFAULT, H5P_DEFAULT),
                            "create dataset " + path);
  bool empty = false;
  for (int i = 0; i < rank; ++i) empty = empty || dims[i] == 0;
  errno = 0;
  if (!empty) check_io(H5Dwrite(set, type, H5S_ALL, H5S_ALL, H5P_DEFAULT, data), "write " + path);
  string_attribute(set, "units", units);
  H5Dclose(set);
  H5Sclose(space);
}

void H5Writer::write(const std::string& path, const std::vector<double>& data, const std::string& units) {
  const hsize_t n = data.size();
  write_numeric(path, H5T_NATIVE_DOUBLE, data.data(), 1, &n, units);
}

void H5Writer::write(const std::string& path, const std::vector<int>& data, const std::string& units) {
  const hsize_t n = data.size();
  write_numeric(path, H5T_NATIVE_INT, data.data(), 1, &n, units);
}

void H5Writer::write(const std::string& path, const std::vector<double>& data, size_t rows, size_t cols,
                     const std::string& units) {
  if (data.size() != rows * cols) throw std::logic_error("H5Writer: shape does not match data for " + path);
  const hsize_t dims[2] = {rows, cols};
  write_numeric(path, H5T_NATIVE_DOUBLE, data.data(), 2, dims, units);
}

void H5Writer::write(const std::string& path, double value, const std::string& units) {
  write_numeric(path, H5T_NATIVE_DOUBLE, &value, 0, nullptr, units);
}

void H5Writer::write(const std::string& path, const std::string& text) {
  const hid_t type = string_type();
  const hid_t space = H5Screate(H5S_SCALAR);
  const hid_t set = checked(H5Dcreate2(file_, full(path).c_str(), type, space, link_props_, H5P_DEFAULT, H5P_DEFAULT),
                            "create dataset " + path);
  const char* p = text.c_str();
  check(H5Dwrite(set, type, H5S_ALL, H5S_ALL, H5P_DEFAULT, &p), "write " + path);
  string_attribute(set, "units", "1");
  H5Dclose(set);
  H5Sclose(space);
  H5Tclose(type);
}

void H5Writer::write(const std::string& path, const std::vector<std::string>& texts, const std::string& units) {
  const hid_t type = string_type();
  const hsize_t n = texts.size();
  const hid_t space = H5Screate_simple(1, &n, nullptr);
  const hid_t set = checked(H5Dcreate2(file_, full(path).c_str(), type, space, link_props_, H5P_DEFAULT, H5P_DEFAULT),
                            "create dataset " + path);
  std::vector<const char*> ptrs;
  for (const auto& t : texts) ptrs.push_back(t.c_str());
  if (n > 0) check(H5Dwrite(set, type, H5S_ALL, H5S_ALL, H5P_DEFAULT, ptrs.data()), "write " + path);
  string_attribute(set, "units", units);
  H5Dclose(set);
  H5Sclose(space);
  H5Tclose(type);
}

void H5Writer::attribute(const std::string& object, const std::string& name, const std::string& value) {
  const hid_t obj = checked(H5Oopen(file_, full(object).c_str(), H5P_DEFAULT), "open " + full(object));
  string_attribute(obj, name, value);
  H5Oclose(obj);
}

void H5Writer::attribute(const std::string& object, const std::string& name, const std::vector<int>& values) {
  const hid_t obj = checked(H5Oopen(file_, full(object).c_str(), H5P_DEFAULT), "open " + full(object));
  const hsize_t n = values.size();
  const hid_t space = n == 0 ? H5Screate(H5S_NULL) : H5Screate_simple(1, &n, nullptr);
  const hid_t attr = checked(H5Acreate2(obj, name.c_str(), H5T_NATIVE_INT, space, H5P_DEFAULT, H5P_DEFAULT),
                             "create attribute " + name);
  if (n > 0) check(H5Awrite(attr, H5T_NATIVE_INT, values.data()), "write attribute " + name);
  H5Aclose(attr);
  H5Sclose(space);
  H5Oclose(obj);
}

}  // namespace oxystrat
