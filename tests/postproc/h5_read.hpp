// Reading HDF5 files back with the plain C API, independent of the writer under test.
#pragma once

#include <hdf5.h>

#include <stdexcept>
#include <cmath>
#include <string>
#include <vector>

namespace oxystrat::test {

//! An hid_t closed by the given function.
class H5Handle {
 public:
  H5Handle(hid_t id, herr_t (*close)(hid_t)) : id_(id), close_(close) {
    if (id_ < 0) throw std::runtime_error("HDF5 handle could not be opened");
  }
  ~H5Handle() { close_(id_); }
  H5Handle(const H5Handle&) = delete;
  H5Handle& operator=(const H5Handle&) = delete;
  operator hid_t() const { return id_; }

 private:
  hid_t id_;
  herr_t (*close_)(hid_t);
};

inline H5Handle open_h5(const std::string& path) { return {H5Fopen(path.c_str(), H5F_ACC_RDONLY, H5P_DEFAULT), H5Fclose}; }

inline H5Handle variable_string_type() {
  const hid_t t = H5Tcopy(H5T_C_S1);
  H5Tset_size(t, H5T_VARIABLE);
  H5Tset_cset(t, H5T_CSET_UTF8);  // HDF5 converts no strings between character sets
  return {t, H5Tclose};
}

//! Dimensions of a dataset (empty for a scalar).
inline std::vector<hsize_t> dims_of(hid_t file, const std::string& path) {
  H5Handle set(H5Dopen2(file, path.c_str(), H5P_DEFAULT), H5Dclose);
  H5Handle space(H5Dget_space(set), H5Sclose);
  const int rank = H5Sget_simple_extent_ndims(space);
  std::vector<hsize_t> dims(static_cast<size_t>(rank));
  if (rank > 0) H5Sget_simple_extent_dims(space, dims.data(), nullptr);
  return dims;
}

inline size_t element_count(const std::vector<hsize_t>& dims) {
  size_t n = 1;
  for (auto d : dims) n *= d;
  return n;
}

//! H5T_class_t of a dataset's stored type (H5T_FLOAT, H5T_INTEGER, H5T_STRING).
inline H5T_class_t class_of(hid_t file, const std::string& path) {
  H5Handle set(H5Dopen2(file, path.c_str(), H5P_DEFAULT), H5Dclose);
  H5Handle type(H5Dget_type(set), H5Tclose);
  return H5Tget_class(type);
}

template <typename T>
std::vector<T> read_numbers(hid_t file, const std::string& path, hid_t mem_type) {
  const auto n = element_count(dims_of(file, path));
  std::vector<T> out(n);
  H5Handle set(H5Dopen2(file, path.c_str(), H5P_DEFAULT), H5Dclose);
  if (n > 0 && H5Dread(set, mem_type, H5S_ALL, H5S_ALL, H5P_DEFAULT, out.data()) < 0) {
    throw std::runtime_error("cannot read " + path);
  }
  return out;
}

inline std::vector<double> read_doubles(hid_t file, const std::string& path) {
  return read_numbers<double>(file, path, H5T_NATIVE_DOUBLE);
}
inline std::vector<int> read_ints(hid_t file, const std::string& path) {
  return read_numbers<int>(file, path, H5T_NATIVE_INT);
}

//! All strings of a scalar or 1-D variable-length string dataset.
inline std::vector<std::string> read_strings(hid_t file, const std::string& path) {
  const auto n = element_count(dims_of(file, path));
  std::vector<char*> raw(n, nullptr);
  H5Handle set(H5Dopen2(file, path.c_str(), H5P_DEFAULT), H5Dclose);
  const auto type = variable_string_type();
  if (n > 0 && H5Dread(set, type, H5S_ALL, H5S_ALL, H5P_DEFAULT, raw.data()) < 0) {
    throw std::runtime_error("cannot read " + path);
  }
  std::vector<std::string> out;
  for (char* p : raw) {
    out.emplace_back(p != nullptr ? p : "");
    H5free_memory(p);
  }
  return out;
}

inline std::string read_string(hid_t file, const std::string& path) {
  const auto all = read_strings(file, path);
  if (all.size() != 1) throw std::runtime_error(path + " is not one string");
  return all.front();
}

//! A string attribute of an object, or throws when it is absent.
inline std::string read_attribute(hid_t file, const std::string& object, const std::string& name) {
  H5Handle attr(H5Aopen_by_name(file, object.c_str(), name.c_str(), H5P_DEFAULT, H5P_DEFAULT), H5Aclose);
  const auto type = variable_string_type();
  char* p = nullptr;
  if (H5Aread(attr, type, &p) < 0) throw std::runtime_error("cannot read attribute " + name + " of " + object);
  std::string out = p != nullptr ? p : "";
  H5free_memory(p);
  return out;
}

//! Every dataset in the file (full paths without the leading '/'), and those of them that have
//! no "units" attribute.
struct DatasetWalk {
  std::vector<std::string> all;
  std::vector<std::string> without_units;
};

inline herr_t visit_dataset(hid_t root, const char* name, const H5O_info_t* info, void* data) {
  auto* walk = static_cast<DatasetWalk*>(data);
  if (info->type == H5O_TYPE_DATASET) {
    walk->all.emplace_back(name);
    if (H5Aexists_by_name(root, name, "units", H5P_DEFAULT) <= 0) walk->without_units.emplace_back(name);
  }
  return 0;
}

inline DatasetWalk walk_datasets(hid_t file) {
  DatasetWalk walk;
  if (H5Ovisit2(file, H5_INDEX_NAME, H5_ITER_NATIVE, visit_dataset, &walk, H5O_INFO_BASIC) < 0) {
    throw std::runtime_error("cannot walk the HDF5 file");
  }
  return walk;
}

//! The floating-point datasets holding a NaN or an infinity (a value that does not apply must be
//! absent instead: docs/outputs.md).
inline std::vector<std::string> non_finite_datasets(hid_t file) {
  std::vector<std::string> bad;
  for (const auto& name : walk_datasets(file).all) {
    if (class_of(file, "/" + name) != H5T_FLOAT) continue;
    for (double v : read_doubles(file, "/" + name)) {
      if (!std::isfinite(v)) {
        bad.push_back(name);
        break;
      }
    }
  }
  return bad;
}

}  // namespace oxystrat::test
