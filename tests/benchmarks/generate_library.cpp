// Writes a library of invented beam files for benchmarking (seeded, so
// anyone can reproduce the figures): "typical" beams of 1-6 spans with 1-3
// loads per span and 10 stations per span, or one long beam.
//
//   generate_library DIR COUNT [SEED]        COUNT typical beams in DIR
//   generate_library --long FILE SPANS [SEED] one beam of SPANS spans
//   generate_library --patterned FILE SPANS [SEED]
//                                             one beam of SPANS spans, 4 stations
//                                             per span, with its loads as "dead"
//                                             and a "live" UDL on every span, and
//                                             a combination with the live load
//                                             patterned (every arrangement)
//   generate_library --loads FILE COUNT [SEED] one 20 m span (pinned, roller)
//                                             with COUNT point loads
//   generate_library --moving FILE SPANS [SEED]
//                                             one beam of SPANS spans, 10 stations
//                                             per span, its loads as "dead", a
//                                             two-point train (100 kN and 60 kN,
//                                             3.5 m apart) running either way,
//                                             and dead + 1.5 x train
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <random>
#include <string>

namespace {

std::string beam_text(std::mt19937& rng, std::size_t spans, int stations, bool patterned = false, bool moving = false) {
  std::uniform_real_distribution<double> U(0.0, 1.0);
  auto num = [](double v) {
    char b[32];
    std::snprintf(b, sizeof b, "%.4g", v);
    return std::string(b);
  };
  std::string s = "{\"title\": \"generated beam\", \"units\": {\"force\": \"kN\", \"length\": \"m\"},\n\"spans\": [";
  for (std::size_t i = 0; i < spans; ++i)
    s += std::string(i ? "," : "") + "{\"length\": " + num(3 + 7 * U(rng)) + ", \"EI\": " + num(2e4 + 2e5 * U(rng)) + "}";
  s += "],\n\"supports\": [";
  for (std::size_t i = 0; i <= spans; ++i) {
    const char* t = i == 0 ? (U(rng) < 0.3 ? "\"fixed\"" : "\"pinned\"") : (i == spans && U(rng) < 0.2 ? "\"fixed\"" : "\"roller\"");
    s += std::string(i ? "," : "") + t;
  }
  s += "],\n\"loads\": [";
  bool first = true;
  for (std::size_t i = 0; i < spans; ++i) {
    const int n = 1 + static_cast<int>(rng() % 3);
    for (int k = 0; k < n; ++k) {
      s += first ? "" : ",";
      first = false;
      const std::string span = std::to_string(i + 1);
      const std::string cs = patterned || moving ? ", \"case\": \"dead\"}" : "}";
      switch (rng() % 3) {
        case 0: s += "{\"type\": \"udl\", \"span\": " + span + ", \"w\": " + num(2 + 20 * U(rng)) + cs; break;
        case 1: s += "{\"type\": \"point\", \"span\": " + span + ", \"P\": " + num(5 + 50 * U(rng)) + ", \"at\": " + num(0.5 + 2 * U(rng)) + cs; break;
        default: s += "{\"type\": \"linear\", \"span\": " + span + ", \"w1\": 0, \"w2\": " + num(2 + 10 * U(rng)) + cs;
      }
    }
    if (patterned) s += ",{\"type\": \"udl\", \"span\": " + std::to_string(i + 1) + ", \"w\": " + num(3 + 10 * U(rng)) + ", \"case\": \"live\"}";
  }
  s += "],\n\"stations_per_span\": " + std::to_string(stations);
  if (patterned)
    s += ",\n\"combinations\": [{\"name\": \"strength\", \"factors\": {\"dead\": 1.2, \"live\": 1.6}, \"pattern\": [\"live\"]}]";
  if (moving)
    s += ",\n\"moving_loads\": [{\"name\": \"train\", \"points\": [{\"P\": 100, \"offset\": 0}, {\"P\": 60, \"offset\": 3.5}]}]"
         ",\n\"combinations\": [{\"name\": \"dead+train\", \"factors\": {\"dead\": 1.2, \"train\": 1.5}}]";
  s += "}\n";
  return s;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc >= 4 && std::string(argv[1]) == "--loads") {
    std::mt19937 rng(argc > 4 ? static_cast<unsigned>(std::atoi(argv[4])) : 1u);
    std::uniform_real_distribution<double> U(0.0, 1.0);
    const long count = std::atol(argv[3]);
    std::ofstream out(argv[2]);
    out << "{\"title\": \"one span, many point loads\", \"units\": {\"force\": \"kN\", \"length\": \"m\"},\n"
           "\"spans\": [{\"length\": 20, \"EI\": 50000}], \"supports\": [\"pinned\", \"roller\"],\n\"loads\": [";
    char b[96];
    for (long i = 0; i < count; ++i) {
      std::snprintf(b, sizeof b, "%s{\"type\": \"point\", \"span\": 1, \"P\": %.4g, \"at\": %.6f}", i ? ",\n" : "",
                    1 + 9 * U(rng), 0.001 + 19.998 * U(rng));
      out << b;
    }
    out << "]}\n";
    return 0;
  }
  if (argc >= 4 && std::string(argv[1]) == "--patterned") {
    std::mt19937 rng(argc > 4 ? static_cast<unsigned>(std::atoi(argv[4])) : 1u);
    std::ofstream(argv[2]) << beam_text(rng, static_cast<std::size_t>(std::atol(argv[3])), 4, true);
    return 0;
  }
  if (argc >= 4 && std::string(argv[1]) == "--moving") {
    std::mt19937 rng(argc > 4 ? static_cast<unsigned>(std::atoi(argv[4])) : 1u);
    std::ofstream(argv[2]) << beam_text(rng, static_cast<std::size_t>(std::atol(argv[3])), 10, false, true);
    return 0;
  }
  if (argc >= 4 && std::string(argv[1]) == "--long") {
    std::mt19937 rng(argc > 4 ? static_cast<unsigned>(std::atoi(argv[4])) : 1u);
    std::ofstream(argv[2]) << beam_text(rng, static_cast<std::size_t>(std::atol(argv[3])), 1);
    return 0;
  }
  if (argc < 3) {
    std::fprintf(stderr, "usage: generate_library DIR COUNT [SEED] | --long FILE SPANS [SEED] | --patterned FILE SPANS [SEED] | --loads FILE COUNT [SEED] | --moving FILE SPANS [SEED]\n");
    return 2;
  }
  const std::filesystem::path dir(argv[1]);
  std::filesystem::create_directories(dir);
  const long count = std::atol(argv[2]);
  std::mt19937 rng(argc > 3 ? static_cast<unsigned>(std::atoi(argv[3])) : 1u);
  for (long i = 0; i < count; ++i) {
    char name[32];
    std::snprintf(name, sizeof name, "beam-%05ld.json", i);
    std::ofstream(dir / name) << beam_text(rng, 1 + rng() % 6, 10);
  }
  return 0;
}
