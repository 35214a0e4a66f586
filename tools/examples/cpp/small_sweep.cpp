// Five cases of a frequency sweep of a config, run in parallel; one sweep.csv row each.
#include <cstdio>
#include <map>
#include <memory>

#include "flapline/flapline.hpp"

int main(int argc, char** argv) {
  using namespace flapline;
  if (argc < 2) {
    std::fprintf(stderr, "usage: small_sweep CONFIG.yaml\n");
    return 2;
  }
  const io::CaseLoader loader(argv[1], {});
  studies::Design design;
  design.keys = {studies::parse_vary("gait.frequency=20:30:5")};
  const std::vector<studies::CaseSpec> cases = studies::make_cases(design);
  std::vector<std::size_t> all{0, 1, 2, 3, 4};
  std::map<std::size_t, std::string> rows;
  studies::run_cases(cases, all,
                     io::case_builders(loader),  // a copy of the loader per worker thread
                     {}, [&](std::size_t i, const RunSummary& s) {
                       rows[i] = studies::table_row(i, {"gait.frequency"}, cases[i], s);
                     });
  std::fputs(io::sweep_csv({"gait.frequency"}, rows).substr(0, 200).c_str(), stdout);
  std::printf("...\n%zu rows\n", rows.size());
  return rows.size() == 5 ? 0 : 1;
}
