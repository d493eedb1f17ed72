// oxystrat check CASE: validate a case and print the geometry it describes; writes nothing.
#include <fmt/format.h>

#include "cli/common.hpp"
#include "postproc/report/text_summary.hpp"
#include "mesh/zone_network.hpp"
#include "solver/oxygen/transient_events.hpp"

namespace oxystrat::cli {

void add_check_command(CLI::App& app) {
  auto* cmd = app.add_subcommand("check", "Validate a case file and print the derived geometry (writes nothing)");
  auto opts = std::make_shared<CaseOptions>();
  add_case_options(*cmd, *opts);
  cmd->callback([opts] {
    const auto loaded = load_case(*opts);
    const auto net = build_zone_geometry(loaded.data);
    check_transient_events(loaded, case_overrides(*opts));  // what `transient` would refuse
    fmt::print("{}", geometry_summary(loaded, net));
    fmt::print("Case is valid.\n");
  });
}

}  // namespace oxystrat::cli
