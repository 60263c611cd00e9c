// trivet benchmarks: time per span of each method from 10 to 1,000,000
// spans (it must stay flat: O(n)), a bare tridiagonal (Thomas) solve of the
// same number of unknowns as a yardstick, the reader, the JSON writer, the
// whole check of a typical beam, and extended and exact arithmetic.
#include <benchmark/benchmark.h>

#include <random>
#include <sstream>

#include "harness/cli/memory.h"
#include "harness/compare/compare.h"
#include "harness/input/reader.h"
#include "harness/precision/exact_reader.h"
#include "harness/precision/precision.h"
#include "methods/beam/beam.h"
#include "methods/slope_deflection/slope_deflection.h"
#include "methods/stiffness/stiffness.h"
#include "methods/three_moment/three_moment.h"
#include "reports/reports.h"

namespace {

using namespace trivet;

// n spans, pinned/roller, a UDL and a point load on every span.
Beam long_beam(std::size_t n) {
  std::mt19937 rng(7);
  std::uniform_real_distribution<double> U(0.0, 1.0);
  Beam b;
  b.spans.reserve(n);
  for (std::size_t i = 0; i < n; ++i) b.spans.push_back({3.0 + 4.0 * U(rng), 5e4 * (1.0 + U(rng))});
  b.supports.assign(n + 1, Support{});
  b.supports[0].type = SupportType::Pinned;
  for (std::size_t i = 1; i <= n; ++i) b.supports[i].type = SupportType::Roller;
  b.labels.assign(n + 1, "N");
  b.loads.reserve(2 * n);
  for (std::size_t i = 0; i < n; ++i) {
    Load u;
    u.type = LoadType::Udl; u.index = i; u.w1 = u.w2 = 10.0; u.from = 0; u.to = b.spans[i].length;
    Load p;
    p.type = LoadType::Point; p.index = i; p.P = 20.0; p.at = 0.4 * b.spans[i].length;
    b.loads.push_back(u);
    b.loads.push_back(p);
  }
  return b;
}

// The time per span (or per unknown) of one iteration, as a counter.
void per_span(benchmark::State& state, std::size_t n) {
  state.counters["ns_per_span"] = benchmark::Counter(static_cast<double>(n),
                                                     benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}

template <Solution (*Solve)(const Beam&, const std::vector<Station>&)>
void BM_Method(benchmark::State& state) {
  const Beam b = long_beam(static_cast<std::size_t>(state.range(0)));
  const std::vector<Station> st = build_stations(b, 1);
  // One call before the timing: the first touch of fresh memory (page
  // faults, on this VM the largest cost of a first call) is measured apart,
  // by the all_three first-call row of scripts/benchmark.sh.
  benchmark::DoNotOptimize(Solve(b, st).nodes.data());
  for (auto _ : state) {
    Solution s = Solve(b, st);
    benchmark::DoNotOptimize(s.nodes.data());
  }
  per_span(state, static_cast<std::size_t>(state.range(0)));
}
Solution tm(const Beam& b, const std::vector<Station>& s) { return three_moment::solve<double>(b, s); }
Solution sd(const Beam& b, const std::vector<Station>& s) { return slope_deflection::solve<double>(b, s); }
Solution sf(const Beam& b, const std::vector<Station>& s) { return stiffness::solve<double>(b, s); }
BENCHMARK(BM_Method<tm>)->Name("three_moment/spans")->RangeMultiplier(10)->Range(10, 1000000)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_Method<sd>)->Name("slope_deflection/spans")->RangeMultiplier(10)->Range(10, 1000000)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_Method<sf>)->Name("stiffness/spans")->RangeMultiplier(10)->Range(10, 1000000)->Unit(benchmark::kMillisecond);

// The general (banded, not tridiagonal) path of the stiffness solve: the
// long beam with a fixed left end and vertical springs at the interior
// nodes, so each node has a free deflection (half-bandwidth 3).
void BM_StiffnessSprings(benchmark::State& state) {
  const std::size_t n = static_cast<std::size_t>(state.range(0));
  Beam b = long_beam(n);
  b.supports[0].type = SupportType::Fixed;
  for (std::size_t i = 1; i < n; ++i) {
    b.supports[i].type = SupportType::Spring;
    b.supports[i].k = 2e4;
  }
  const std::vector<Station> st = build_stations(b, 1);
  if (sf(b, st).status != MethodStatus::Ok) state.SkipWithError("the spring-supported beam did not solve");
  for (auto _ : state) {
    Solution s = sf(b, st);
    benchmark::DoNotOptimize(s.nodes.data());
  }
  per_span(state, n);
}
BENCHMARK(BM_StiffnessSprings)->Name("stiffness/spring_supports")->Arg(10)->Arg(1000)->Arg(100000)->Unit(benchmark::kMillisecond);

// One simply supported span carrying N point loads (seeded positions and
// values), solved and then read at the ~2N stations of build_stations (two
// at every load, plus the divisions): the cost of many loads on one span,
// for the solve and for `at` together, by each method. The grid is built
// once, outside the timing.
Beam point_loads_beam(std::size_t n) {
  std::mt19937 rng(11);
  std::uniform_real_distribution<double> U(0.0, 1.0);
  Beam b;
  b.spans.push_back({10.0, 5e4});
  b.supports.assign(2, Support{});
  b.supports[0].type = SupportType::Pinned;
  b.supports[1].type = SupportType::Roller;
  b.labels = {"A", "B"};
  b.loads.reserve(n);
  for (std::size_t i = 0; i < n; ++i) {
    Load p;
    p.type = LoadType::Point; p.index = 0; p.P = 1.0 + 9.0 * U(rng); p.at = 10.0 * (0.001 + 0.998 * U(rng));
    b.loads.push_back(p);
  }
  return b;
}

template <Solution (*F)(const Beam&, const std::vector<Station>&)>
void BM_PointLoads(benchmark::State& state) {
  const std::size_t n = static_cast<std::size_t>(state.range(0));
  const Beam b = point_loads_beam(n);
  const std::vector<Station> st = build_stations(b, 10);
  for (auto _ : state) {
    Solution s = F(b, st);
    double sum = 0;
    for (const Station& x : st) sum += s.at(x.span, x.local, x.after).deflection;
    benchmark::DoNotOptimize(sum);
  }
  state.counters["stations"] = static_cast<double>(st.size());
  state.counters["ns_per_load"] = benchmark::Counter(static_cast<double>(n),
                                                     benchmark::Counter::kIsIterationInvariantRate | benchmark::Counter::kInvert);
}
BENCHMARK(BM_PointLoads<tm>)->Name("three_moment/point_loads")->Arg(1000)->Arg(20000)->Arg(100000)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_PointLoads<sd>)->Name("slope_deflection/point_loads")->Arg(1000)->Arg(20000)->Arg(100000)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_PointLoads<sf>)->Name("stiffness/point_loads")->Arg(1000)->Arg(20000)->Arg(100000)->Unit(benchmark::kMillisecond);

// The three solvers one after the other on the same beam (the target is
// the sum, under a second for a million spans).
void BM_AllThree(benchmark::State& state) {
  const Beam b = long_beam(static_cast<std::size_t>(state.range(0)));
  const std::vector<Station> st = build_stations(b, 1);
  for (auto _ : state) {
    Solution s1 = tm(b, st);
    benchmark::DoNotOptimize(s1.nodes.data());
    Solution s2 = sd(b, st);
    benchmark::DoNotOptimize(s2.nodes.data());
    Solution s3 = sf(b, st);
    benchmark::DoNotOptimize(s3.nodes.data());
  }
  per_span(state, static_cast<std::size_t>(state.range(0)));
}
BENCHMARK(BM_AllThree)->Name("all_three/spans")->Arg(100000)->Arg(1000000)->Unit(benchmark::kMillisecond);

// The yardstick: a bare tridiagonal (Thomas) solve of n unknowns.
void BM_Thomas(benchmark::State& state) {
  const std::size_t n = static_cast<std::size_t>(state.range(0));
  std::vector<double> a(n, 1.0), b(n, 4.0), c(n, 1.0), d(n, 1.0), cp(n), x(n);
  for (auto _ : state) {
    cp[0] = c[0] / b[0];
    x[0] = d[0] / b[0];
    for (std::size_t i = 1; i < n; ++i) {
      const double m = 1.0 / (b[i] - a[i] * cp[i - 1]);
      cp[i] = c[i] * m;
      x[i] = (d[i] - a[i] * x[i - 1]) * m;
    }
    for (std::size_t i = n - 1; i-- > 0;) x[i] -= cp[i] * x[i + 1];
    benchmark::DoNotOptimize(x.data());
  }
  per_span(state, n);
}
BENCHMARK(BM_Thomas)->Name("thomas/unknowns")->RangeMultiplier(10)->Range(10, 1000000)->Unit(benchmark::kMillisecond);

// A typical beam: 4 spans, 2 loads per span, 10 stations per span.
const char* kTypical = R"({"title": "typical", "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 6.0, "EI": 52000}, {"length": 7.5, "EI": 52000}, {"length": 6.0, "EI": 52000}, {"length": 4.5, "EI": 52000}],
  "supports": ["fixed", "roller", "roller", "roller", "pinned"],
  "loads": [{"type": "udl", "span": 1, "w": 12}, {"type": "point", "span": 1, "P": 30, "at": 2.5},
            {"type": "udl", "span": 2, "w": 12}, {"type": "linear", "span": 2, "w1": 0, "w2": 6},
            {"type": "udl", "span": 3, "w": 12}, {"type": "point", "span": 3, "P": 18, "at": 4},
            {"type": "udl", "span": 4, "w": 12}, {"type": "couple", "span": 4, "C": 5, "at": 2}],
  "claims": {"values": [{"quantity": "reaction", "node": "B", "value": 100}]}})";

void BM_Reader(benchmark::State& state) {
  for (auto _ : state) {
    input::BeamFile f = input::parse_beam_text(kTypical, "typical.json");
    benchmark::DoNotOptimize(f.beam.spans.data());
  }
}
BENCHMARK(BM_Reader)->Name("typical/reader")->Unit(benchmark::kMicrosecond);

void BM_Check(benchmark::State& state) {
  for (auto _ : state) {
    input::BeamFile f = input::parse_beam_text(kTypical, "typical.json");
    std::vector<reports::Report> r{compare::check(f, {})};
    std::ostringstream out;
    reports::write_json(out, r, {"bench", {}, 1e-6});
    benchmark::DoNotOptimize(out.str().size());
  }
}
BENCHMARK(BM_Check)->Name("typical/check_to_json")->Unit(benchmark::kMicrosecond);

void BM_JsonWriter(benchmark::State& state) {
  input::BeamFile f = input::parse_beam_text(kTypical, "typical.json");
  std::vector<reports::Report> r{compare::check(f, {})};
  for (auto _ : state) {
    std::ostringstream out;
    reports::write_json(out, r, {"bench", {}, 1e-6});
    benchmark::DoNotOptimize(out.str().size());
  }
}
BENCHMARK(BM_JsonWriter)->Name("typical/json_writer")->Unit(benchmark::kMicrosecond);

void BM_Arithmetic(benchmark::State& state) {
  input::BeamFile f = input::parse_beam_text(kTypical, "typical.json");
  const auto exact = precision::read_exact_beam(kTypical, f);
  precision::Options o;
  o.arithmetic = state.range(0) == 0 ? precision::Arithmetic::Extended : precision::Arithmetic::Exact;
  o.reference = false;
  for (auto _ : state) {
    auto r = precision::run_load_set(exact, f, "loads", o);
    benchmark::DoNotOptimize(r.methods.data());
  }
}
BENCHMARK(BM_Arithmetic)->Name("typical/arithmetic")->Arg(0)->Arg(1)->ArgNames({"exact"})->Unit(benchmark::kMillisecond);

}  // namespace

// As trivet's main does (harness/cli/memory.h), so the figures are those of
// the program.
int main(int argc, char** argv) {
  trivet::cli::prefer_huge_pages();
  benchmark::Initialize(&argc, argv);
  if (benchmark::ReportUnrecognizedArguments(argc, argv)) return 1;
  benchmark::RunSpecifiedBenchmarks();
  benchmark::Shutdown();
  return 0;
}
