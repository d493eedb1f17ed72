// H5Writer: every kind of dataset it writes reads back unchanged with its "units" attribute.
#include "postproc/io/h5_writer.hpp"

#include <gtest/gtest.h>

#include <stdexcept>
#include <string>
#include <vector>

#include "h5_read.hpp"
#include "temp_folder.hpp"

namespace oxystrat::test {
namespace {

TEST(H5Writer, NumbersStringsAndAttributesReadBack) {
  TempFolder tmp;
  const auto path = (tmp / "t.h5").string();
  const std::vector<double> reals{0.5, -1.25, 1e-300, 6.02214076e23};
  const std::vector<int> ints{3, -1, 0, 42};
  const std::vector<double> matrix{1, 2, 3, 4, 5, 6};
  {
    H5Writer w(path);
    w.write("/a/reals", reals, "m");
    w.write("/a/ints", ints, "1");
    w.write("/b/c/matrix", matrix, 2, 3, "Pa");
    w.write("/scalar", 2.5, "s");
    w.write("/text", std::string("line 1\nline 2 with ünïcode"));
    w.write("/texts", std::vector<std::string>{"one", "", "three"});
    w.attribute("/a/reals", "meaning", "test values");
    w.attribute("/", "creator", "test");
    w.close();
  }
  const auto f = open_h5(path);
  // Binary doubles and ints: bit-for-bit.
  EXPECT_EQ(read_doubles(f, "/a/reals"), reals);
  EXPECT_EQ(read_ints(f, "/a/ints"), ints);
  EXPECT_EQ(class_of(f, "/a/ints"), H5T_INTEGER);
  EXPECT_EQ(class_of(f, "/a/reals"), H5T_FLOAT);
  EXPECT_EQ(dims_of(f, "/b/c/matrix"), (std::vector<hsize_t>{2, 3}));
  EXPECT_EQ(read_doubles(f, "/b/c/matrix"), matrix);
  EXPECT_TRUE(dims_of(f, "/scalar").empty());
  EXPECT_EQ(read_doubles(f, "/scalar"), std::vector<double>{2.5});
  EXPECT_EQ(read_string(f, "/text"), "line 1\nline 2 with ünïcode");
  EXPECT_EQ(read_strings(f, "/texts"), (std::vector<std::string>{"one", "", "three"}));
  EXPECT_EQ(read_attribute(f, "/a/reals", "units"), "m");
  EXPECT_EQ(read_attribute(f, "/a/ints", "units"), "1");
  EXPECT_EQ(read_attribute(f, "/b/c/matrix", "units"), "Pa");
  EXPECT_EQ(read_attribute(f, "/scalar", "units"), "s");
  EXPECT_EQ(read_attribute(f, "/text", "units"), "1");
  EXPECT_EQ(read_attribute(f, "/texts", "units"), "1");
  EXPECT_EQ(read_attribute(f, "/a/reals", "meaning"), "test values");
  EXPECT_EQ(read_attribute(f, "/", "creator"), "test");
}

TEST(H5Writer, EveryFileCarriesTheFormatVersion) {
  // Written by the constructor: a file with nothing else in it has it, so every command's file has.
  TempFolder tmp;
  const auto path = (tmp / "empty.h5").string();
  {
    H5Writer w(path);
    w.close();
  }
  const auto f = open_h5(path);
  EXPECT_EQ(read_attribute(f, "/", "format_version"), "2.0");
  EXPECT_EQ(std::string(kH5FormatVersion), "2.0");
}

TEST(H5Writer, EmptyArraysAreWritten) {
  TempFolder tmp;
  const auto path = (tmp / "empty.h5").string();
  {
    H5Writer w(path);
    w.write("/none", std::vector<double>{}, "m");
    w.write("/no_ints", std::vector<int>{}, "1");
    w.write("/no_texts", std::vector<std::string>{});
    w.close();
  }
  const auto f = open_h5(path);
  EXPECT_EQ(dims_of(f, "/none"), std::vector<hsize_t>{0});
  EXPECT_TRUE(read_doubles(f, "/none").empty());
  EXPECT_TRUE(read_ints(f, "/no_ints").empty());
  EXPECT_TRUE(read_strings(f, "/no_texts").empty());
  EXPECT_EQ(read_attribute(f, "/none", "units"), "m");
}

TEST(H5Writer, ShapeMismatchIsRefused) {
  TempFolder tmp;
  H5Writer w((tmp / "bad.h5").string());
  EXPECT_THROW(w.write("/m", std::vector<double>{1, 2, 3}, 2, 2, "1"), std::logic_error);
}

TEST(H5Writer, DatasetWrittenTwiceIsAnError) {
  TempFolder tmp;
  H5Writer w((tmp / "twice.h5").string());
  w.write("/x", 1.0, "1");
  EXPECT_THROW(w.write("/x", 2.0, "1"), std::runtime_error);
}

TEST(H5Writer, UnwritablePathIsAnError) {
  try {
    H5Writer w("/nonexistent/folder/x.h5");
    ADD_FAILURE() << "created a file in a folder that does not exist";
  } catch (const std::runtime_error& e) {
    EXPECT_NE(std::string(e.what()).find("HDF5: cannot create /nonexistent/folder/x.h5"), std::string::npos);
  }
}

TEST(H5Writer, AttributeOnAMissingObjectIsAnError) {
  TempFolder tmp;
  H5Writer w((tmp / "attr.h5").string());
  EXPECT_THROW(w.attribute("/missing", "units", "m"), std::runtime_error);
}

}  // namespace
}  // namespace oxystrat::test
