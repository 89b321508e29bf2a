// Reading the ParaView files of a finished run back with VTK's own XML
// reader and parser, for the end-to-end checks. Any error or warning VTK
// raises while reading is collected, so a test can require a clean read.
#pragma once

#include <vtkCallbackCommand.h>
#include <vtkCommand.h>
#include <vtkNew.h>
#include <vtkSmartPointer.h>
#include <vtkUnstructuredGrid.h>
#include <vtkXMLDataElement.h>
#include <vtkXMLDataParser.h>
#include <vtkXMLUnstructuredGridReader.h>

#include <filesystem>
#include <string>
#include <vector>

namespace plystrain::test {

struct VtuReadback {
  vtkSmartPointer<vtkUnstructuredGrid> grid;
  int problems = 0;  // errors and warnings VTK reported while reading
};

namespace detail {

inline void count_problem(vtkObject*, unsigned long, void* client_data, void*) {
  ++*static_cast<int*>(client_data);
}

}  // namespace detail

inline VtuReadback read_vtu(const std::filesystem::path& path) {
  VtuReadback result;
  vtkNew<vtkCallbackCommand> counter;
  counter->SetCallback(detail::count_problem);
  counter->SetClientData(&result.problems);
  vtkNew<vtkXMLUnstructuredGridReader> reader;
  reader->AddObserver(vtkCommand::ErrorEvent, counter);
  reader->AddObserver(vtkCommand::WarningEvent, counter);
  if (reader->CanReadFile(path.string().c_str()) == 0) {
    ++result.problems;
    return result;
  }
  reader->SetFileName(path.string().c_str());
  reader->Update();
  result.grid = reader->GetOutput();
  return result;
}

struct CollectionEntry {
  double timestep = 0.0;
  std::string file;
};

struct CollectionReadback {
  bool parsed = false;
  std::string root_type;
  std::vector<CollectionEntry> entries;
  int malformed_entries = 0;  // DataSet elements without a numeric timestep or a file
};

// Parses a .pvd with VTK's XML parser (a well-formedness check in itself) and
// lists its DataSet elements in file order.
inline CollectionReadback read_collection(const std::filesystem::path& path) {
  CollectionReadback result;
  vtkNew<vtkXMLDataParser> parser;
  parser->SetFileName(path.string().c_str());
  if (parser->Parse() != 1) {
    return result;
  }
  result.parsed = true;
  vtkXMLDataElement* root = parser->GetRootElement();
  if (root == nullptr) {
    result.parsed = false;
    return result;
  }
  const char* type = root->GetAttribute("type");
  result.root_type = type ? type : "";
  vtkXMLDataElement* collection = root->FindNestedElementWithName("Collection");
  if (collection == nullptr) {
    return result;
  }
  for (int i = 0; i < collection->GetNumberOfNestedElements(); ++i) {
    vtkXMLDataElement* element = collection->GetNestedElement(i);
    if (std::string(element->GetName()) != "DataSet") {
      continue;
    }
    CollectionEntry entry;
    const char* file = element->GetAttribute("file");
    if (element->GetScalarAttribute("timestep", entry.timestep) == 0 || file == nullptr) {
      ++result.malformed_entries;
      continue;
    }
    entry.file = file;
    result.entries.push_back(entry);
  }
  return result;
}

}  // namespace plystrain::test
