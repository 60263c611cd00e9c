// The bad-input corpus (tests/corpus/bad): every malformed file gives
// exactly the messages of its NAME.expected, through the reader and through
// `trivet check` (exit 2, "file: /json/pointer (where): reason"). The files
// the fuzzer found (tests/corpus/fuzz-found) give their expected outcome and
// go through the whole check without an exception. The limits of
// reader.h are refused at the limit + 1, with files generated here.
#include <gtest/gtest.h>

#include <sys/wait.h>

#include <algorithm>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "harness/compare/compare.h"
#include "harness/input/reader.h"

#ifndef TRIVET_CORPUS_DIR
#error "TRIVET_CORPUS_DIR must name tests/corpus"
#endif
#ifndef TRIVET_EXE
#error "TRIVET_EXE must name the trivet program"
#endif

namespace trivet::input {
namespace {

namespace fs = std::filesystem;

std::vector<std::string> lines_of(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::vector<std::string> out;
  std::string line;
  while (std::getline(in, line)) out.push_back(line);
  return out;
}

std::string text_of(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

std::vector<fs::path> beam_files(const fs::path& dir) {
  std::vector<fs::path> out;
  for (const auto& e : fs::directory_iterator(dir))
    if (e.path().extension() == ".json") out.push_back(e.path());
  std::sort(out.begin(), out.end());
  return out;
}

std::vector<std::string> messages(const BeamFile& f, const std::string& display) {
  std::vector<std::string> out;
  for (const auto& e : f.errors) out.push_back(e.format(display));
  return out;
}

// Runs a shell command; its exit status and standard output.
std::pair<int, std::string> run(const std::string& command) {
  std::string out;
  FILE* p = popen(command.c_str(), "r");
  if (!p) return {-1, ""};
  char buf[4096];
  std::size_t n;
  while ((n = fread(buf, 1, sizeof buf, p)) > 0) out.append(buf, n);
  const int status = pclose(p);
  return {WIFEXITED(status) ? WEXITSTATUS(status) : -1, out};
}

std::string quoted(const std::string& s) {
  std::string r = "'";
  for (char c : s) r += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return r + "'";
}

const fs::path kBad = fs::path(TRIVET_CORPUS_DIR) / "bad";
const fs::path kFuzzFound = fs::path(TRIVET_CORPUS_DIR) / "fuzz-found";

TEST(BadCorpus, HasAtLeastSixtyFilesEachWithItsExpectedMessages) {
  const auto files = beam_files(kBad);
  EXPECT_GE(files.size(), 60u);
  for (const auto& f : files) {
    fs::path expected = f;
    expected.replace_extension(".expected");
    EXPECT_TRUE(fs::exists(expected)) << expected;
  }
}

TEST(BadCorpus, TheReaderGivesExactlyTheExpectedMessages) {
  for (const auto& f : beam_files(kBad)) {
    fs::path expected = f;
    expected.replace_extension(".expected");
    const std::string name = f.filename().string();
    const auto want = lines_of(expected);
    ASSERT_FALSE(want.empty()) << expected << " is empty";
    const BeamFile b = read_beam_file(f.string());
    EXPECT_FALSE(b.ok()) << name;
    EXPECT_EQ(messages(b, name), want) << name;
  }
}

// Each file on its own: `trivet check NAME.json` exits 2 and prints each
// expected message (the tables print "  error: MESSAGE").
TEST(BadCorpus, TheProgramExitsTwoWithTheMessages) {
  for (const auto& f : beam_files(kBad)) {
    fs::path expected = f;
    expected.replace_extension(".expected");
    const std::string name = f.filename().string();
    const auto [code, out] = run("cd " + quoted(kBad.string()) + " && " + quoted(TRIVET_EXE) + " check " + quoted(name) + " 2>&1");
    EXPECT_EQ(code, 2) << name << "\n" << out;
    for (const auto& m : lines_of(expected))
      EXPECT_NE(out.find("  error: " + m + "\n"), std::string::npos) << name << ": missing\n  " << m << "\nin\n" << out;
  }
}

// The corpus as one library: every file is in the JSON report, invalid,
// with its messages; the run exits 2.
TEST(BadCorpus, ALibraryRunReportsEveryFile) {
  const fs::path report = fs::temp_directory_path() / ("trivet-corpus-" + std::to_string(getpid()) + ".json");
  const auto [code, out] = run("cd " + quoted(kBad.string()) + " && " + quoted(TRIVET_EXE) + " check . --jobs 2 --json " +
                               quoted(report.string()) + " >/dev/null 2>&1");
  EXPECT_EQ(code, 2);
  const std::string json = text_of(report);
  fs::remove(report);
  std::size_t invalid = 0;
  for (std::size_t p = json.find("\"status\": \"invalid\""); p != std::string::npos; p = json.find("\"status\": \"invalid\"", p + 1))
    ++invalid;
  EXPECT_EQ(invalid, beam_files(kBad).size());
  for (const auto& f : beam_files(kBad))
    EXPECT_NE(json.find("\"file\": \"./" + f.filename().string() + "\""), std::string::npos) << f;
}

// Inputs the fuzzer found: NAME.expected holds the messages, or the single
// line "accepted". Every one also goes through the whole check.
TEST(FuzzFound, EachGivesItsExpectedOutcome) {
  for (const auto& f : beam_files(kFuzzFound)) {
    fs::path expected = f;
    expected.replace_extension(".expected");
    const std::string name = f.filename().string();
    const auto want = lines_of(expected);
    ASSERT_FALSE(want.empty()) << expected;
    const BeamFile b = read_beam_file(f.string());
    if (want == std::vector<std::string>{"accepted"}) EXPECT_TRUE(b.ok()) << name << ": " << ::testing::PrintToString(messages(b, name));
    else EXPECT_EQ(messages(b, name), want) << name;
    compare::Options opt;
    const compare::BeamResult r = compare::check(b, opt);
    // Invalid when the reader refuses it, or when the reader accepts it but
    // no method can compute it in double (then the error says so).
    bool uncomputable = false;
    for (const auto& e : r.errors) uncomputable = uncomputable || e.reason.find("no method could compute") != std::string::npos;
    EXPECT_EQ(r.status == compare::BeamStatus::Invalid, !b.ok() || uncomputable) << name;
    if (b.ok() && r.status == compare::BeamStatus::Invalid) {
      EXPECT_TRUE(uncomputable) << name;
    }
  }
}

// ---- limits, with generated files ----

std::string numbers(std::size_t n) {
  std::string s = "[";
  s.reserve(2 * n + 2);
  for (std::size_t i = 0; i < n; ++i) s += i ? ",0" : "0";
  return s + "]";
}

// A valid beam of `spans` spans, with `per_span` stations and the given loads.
std::string beam_text(std::size_t spans, int per_span, const std::string& loads) {
  std::string s = "{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"stations_per_span\": " + std::to_string(per_span) +
                  ", \"spans\": [";
  for (std::size_t i = 0; i < spans; ++i) s += i ? ",{\"length\":1,\"EI\":1}" : "{\"length\":1,\"EI\":1}";
  s += "], \"supports\": [";
  for (std::size_t i = 0; i <= spans; ++i) s += i ? ",\"pinned\"" : "\"pinned\"";
  return s + "], \"loads\": " + loads + "}";
}

std::string udls(std::size_t n, bool own_cases) {
  std::string s = "[";
  for (std::size_t i = 0; i < n; ++i) {
    s += i ? "," : "";
    s += "{\"type\":\"udl\",\"span\":1,\"w\":1";
    if (own_cases) s += ",\"case\":\"c" + std::to_string(i) + "\"";
    s += "}";
  }
  return s + "]";
}

std::vector<std::string> read_messages(const std::string& text, const Limits& limits = {}) {
  return messages(parse_beam_text(text, "big.json", limits), "big.json");
}

bool mentions_a_limit(const std::vector<std::string>& m) {
  for (const auto& s : m)
    if (s.find("limit") != std::string::npos) return true;
  return false;
}

TEST(Limits, SpansAtTheLimitAreCountedAndOneMoreIsRefused) {
  const Limits lim;
  const std::string over = "{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"spans\": " + numbers(lim.max_spans + 1) +
                           ", \"supports\": []}";
  auto m = read_messages(over);
  ASSERT_FALSE(m.empty());
  EXPECT_EQ(m.front(), "big.json: /spans: has 1000001 spans, more than the limit of 1000000");
  const std::string at = "{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"spans\": " + numbers(lim.max_spans) +
                         ", \"supports\": []}";
  m = read_messages(at);
  ASSERT_FALSE(m.empty());
  EXPECT_FALSE(mentions_a_limit(m)) << m.front();
  EXPECT_EQ(m.front(), "big.json: /spans/0 (span 1): must be an object with length and EI (got 0)");
}

TEST(Limits, LoadsBeyondTheLimitAreRefused) {
  const std::string over = "{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"spans\": [{\"length\": 1, \"EI\": 1}], "
                           "\"supports\": [\"pinned\", \"pinned\"], \"loads\": " + numbers(Limits{}.max_loads + 1) + "}";
  EXPECT_EQ(read_messages(over), std::vector<std::string>{"big.json: /loads: has 4000001 loads, more than the limit of 4000000"});
}

TEST(Limits, StationsPerSpanBeyondTheLimitAreRefused) {
  EXPECT_EQ(read_messages(beam_text(1, 1001, "[]")),
            std::vector<std::string>{"big.json: /stations_per_span: must be from 1 to 1000 (got 1001)"});
  EXPECT_TRUE(read_messages(beam_text(1, 1000, "[]")).empty());
}

TEST(Limits, StationsInAllAtTheLimitAndOneMore) {
  // 19,980 spans of 1001 stations: 19,999,980; with 20 loads exactly 20,000,000.
  EXPECT_TRUE(read_messages(beam_text(19'980, 1000, udls(20, false))).empty());
  EXPECT_EQ(read_messages(beam_text(19'980, 1000, udls(21, false))),
            std::vector<std::string>{"big.json: /loads: asks for 20000001 stations in all (20000001 in each of 1 load set), "
                                     "more than the limit of 20000000"});
  EXPECT_EQ(read_messages(beam_text(20'000, 1000, "[]")),
            std::vector<std::string>{"big.json: /stations_per_span: asks for 20020000 stations, more than the limit of 20000000"});
  // Each load case has stations of its own: two cases of 10,000,001 each.
  EXPECT_EQ(read_messages(beam_text(9'991, 1000, udls(2, true))),
            std::vector<std::string>{"big.json: /loads: asks for 20001986 stations in all (10000993 in each of 2 load sets), "
                                     "more than the limit of 20000000"});
}

TEST(Limits, StationsAskedForOnTheCommandLineAreCountedToo) {
  // 19,980 spans with 1 station per span are far inside the limit; with
  // --stations-per-span 1000 they would not be.
  const BeamFile f = parse_beam_text(beam_text(19'980, 1, udls(21, false)), "big.json");
  ASSERT_TRUE(f.ok());
  EXPECT_FALSE(station_limit_error(f, 1000 - 1).has_value());
  EXPECT_FALSE(station_limit_error(f, 1).has_value());
  const auto e = station_limit_error(f, 1000);
  ASSERT_TRUE(e.has_value());
  EXPECT_EQ(e->format("big.json"), "big.json: /stations_per_span: with 1000 stations per span the beam asks for 20000001 "
                                   "stations in all, more than the limit of 20000000");
  // Through the program: refused with exit 2, not analysed.
  const fs::path p = fs::temp_directory_path() / ("trivet-stations-" + std::to_string(getpid()) + ".json");
  { std::ofstream(p.string()) << beam_text(19'980, 1, udls(21, false)); }
  const auto [code, out] = run(quoted(TRIVET_EXE) + " check " + quoted(p.string()) + " --stations-per-span 1000 2>&1");
  fs::remove(p);
  EXPECT_EQ(code, 2) << out;
  EXPECT_NE(out.find("/stations_per_span: with 1000 stations per span the beam asks for 20000001 stations in all"), std::string::npos) << out.substr(0, 2000);
}

TEST(Limits, LoadSetsBeyondTheLimitAreRefused) {
  EXPECT_TRUE(read_messages(beam_text(1, 10, udls(1000, true))).empty());
  EXPECT_EQ(read_messages(beam_text(1, 10, udls(1001, true))),
            std::vector<std::string>{"big.json: /loads: has 1001 load cases and 0 combinations, more than the limit of 1000 load sets"});
}

TEST(Limits, AFileLargerThanTheLimitIsNotRead) {
  // A sparse file one byte over 256 MiB: refused from its size, unread.
  const fs::path big = fs::temp_directory_path() / ("trivet-big-" + std::to_string(getpid()) + ".json");
  { std::ofstream(big.string(), std::ios::binary) << "{"; }
  fs::resize_file(big, (std::size_t{256} << 20) + 1);
  const BeamFile f = read_beam_file(big.string());
  fs::remove(big);
  EXPECT_EQ(messages(f, "big.json"), std::vector<std::string>{"big.json: /: the file is larger than the limit of 256 MiB"});
  // The same rule on text, with a small limit: at the limit it is read.
  Limits small;
  small.max_file_bytes = 2u << 20;
  const std::string at(small.max_file_bytes, ' ');
  EXPECT_EQ(read_messages(at, small), std::vector<std::string>{"big.json: /: the file is empty (a beam file is a JSON object)"});
  EXPECT_EQ(read_messages(at + " ", small), std::vector<std::string>{"big.json: /: the file is larger than the limit of 2 MiB"});
}

TEST(Limits, DeepNestingIsRefusedWithoutCostingMemory) {
  // 64 levels (the object and 63 arrays) are read; 65 are refused; a
  // million are refused just as quickly (the pointer stops at the limit).
  auto nest = [](std::size_t n) { return "{\"title\": " + std::string(n, '[') + std::string(n, ']') + "}"; };
  auto m = read_messages(nest(63));
  ASSERT_FALSE(m.empty());
  EXPECT_EQ(m.front(), "big.json: /title: must be a string (got an array)");
  std::string ptr = "/title";
  for (int i = 0; i < 63; ++i) ptr += "/0";
  EXPECT_EQ(read_messages(nest(64)), std::vector<std::string>{"big.json: " + ptr + ": nested more than 64 levels deep (a beam file needs only a few)"});
  EXPECT_EQ(read_messages(nest(1'000'000)), std::vector<std::string>{"big.json: " + ptr + ": nested more than 64 levels deep (a beam file needs only a few)"});
}

TEST(Limits, AThousandErrorsAreListedAndTheRestCounted) {
  const std::string text = "{\"units\": {\"force\": \"kN\", \"length\": \"m\"}, \"spans\": " + numbers(5000) + ", \"supports\": []}";
  const auto m = read_messages(text);
  ASSERT_EQ(m.size(), 1001u);
  EXPECT_EQ(m.back(), "big.json: /: more than 1000 errors; the rest are not listed");
}

TEST(Reader, ALongOrMalformedStringIsShownPrintably) {
  // Bytes that are not UTF-8 never reach a message (nor the JSON report).
  const BeamFile f = parse_beam_text(std::string("{\"title\": \"a\xff\"}"), "x.json");
  ASSERT_FALSE(f.errors.empty());
  EXPECT_EQ(f.errors.front().format("x.json").rfind("x.json: /: not valid JSON: line 1, column 13: ", 0), 0u)
      << f.errors.front().format("x.json");
  EXPECT_NE(f.errors.front().reason.find("\\xFF"), std::string::npos) << f.errors.front().reason;
  EXPECT_EQ(f.errors.front().reason.find('\xff'), std::string::npos);
  // A multi-byte character is not cut in half at the 40-byte mark.
  const std::string title = std::string(39, 'a') + "\xc3\xa9" + "bbb";
  const BeamFile g = parse_beam_text("{\"title\": 1, \"units\": \"" + title + "\"}", "x.json");
  bool seen = false;
  for (const auto& e : g.errors)
    if (e.pointer == "/units") {
      seen = true;
      EXPECT_NE(e.reason.find(std::string(39, 'a') + "\xc3\xa9..."), std::string::npos) << e.reason;
    }
  EXPECT_TRUE(seen);
}

}  // namespace
}  // namespace trivet::input
