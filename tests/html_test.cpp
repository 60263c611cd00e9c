// The HTML report: one self-contained file with the summary first, a
// section per beam, the plots, the caution and the provenance (SHA-256 of
// each input file); nothing fetched from elsewhere. And SHA-256 itself.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <fstream>
#include <memory>
#include <sstream>
#include <string>
#include <unistd.h>

#include "harness/compare/against.h"
#include "harness/input/reader.h"
#include "reports/html_report.h"
#include "reports/reports.h"
#include "reports/sha256.h"

namespace trivet::reports {
namespace {

const char* kBeam = R"({"title": "two spans & a <cantilever>", "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 5, "EI": 30000}, {"length": 7, "EI": 30000}, {"length": 2, "EI": 30000}],
  "supports": ["fixed", "roller", "roller", "free"],
  "loads": [{"type": "udl", "span": 1, "w": 9.3}, {"type": "point", "span": 2, "P": 4.1, "at": 2.2},
            {"type": "point", "node": 4, "P": 3}],
  "claims": {"values": [{"quantity": "reaction", "node": "B", "value": 1},
                        {"quantity": "moment", "node": "B", "value": -20, "tolerance": "50%"}]}})";

struct TempFile {
  std::string path;
  explicit TempFile(const std::string& content) {
    char name[] = "/tmp/trivet-html-test-XXXXXX";
    const int fd = ::mkstemp(name);
    EXPECT_GE(fd, 0);
    if (fd >= 0) ::close(fd);
    path = name;
    std::ofstream(path, std::ios::binary) << content;
  }
  ~TempFile() { std::remove(path.c_str()); }
};

std::size_t count(const std::string& s, const std::string& what) {
  std::size_t n = 0;
  for (std::size_t at = s.find(what); at != std::string::npos; at = s.find(what, at + 1)) ++n;
  return n;
}

// A beam read from text, reported under `file` (the report reads that
// path for its SHA-256).
reports::Report beam_as(const std::string& file) {
  input::BeamFile f = input::parse_beam_text(kBeam, file);
  EXPECT_TRUE(f.ok());
  return compare::check(f, {});
}

HtmlOptions options() {
  HtmlOptions o;
  o.tool_version = "9.8.7";
  o.command_line = "trivet check a.json --html out.html";
  o.date_utc = "2024-01-02T03:04:05Z";
  return o;
}

TEST(Sha256, KnownValues) {
  // FIPS 180-2, appendix B.1 and B.2; the empty message; a million 'a'.
  EXPECT_EQ(sha256_hex("abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  EXPECT_EQ(sha256_hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq"),
            "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
  EXPECT_EQ(sha256_hex(""), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
  EXPECT_EQ(sha256_hex(std::string(1000000, 'a')), "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
  // Fed in pieces of every size across the 64-byte blocks.
  const std::string text(1000, 'q');
  const std::string whole = sha256_hex(text);
  for (std::size_t piece : {1u, 7u, 63u, 64u, 65u, 999u}) {
    Sha256 h;
    for (std::size_t at = 0; at < text.size(); at += piece) h.update(text.substr(at, piece));
    EXPECT_EQ(h.hex(), whole) << piece;
  }
  TempFile f("abc");
  EXPECT_EQ(sha256_file(f.path).value_or(""), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  EXPECT_FALSE(sha256_file("/nonexistent/file").has_value());
}

TEST(Html, SummarySectionsCautionProvenanceAndNoExternalReferences) {
  // The first beam's file holds "abc", so its SHA-256 is the known one.
  TempFile abc("abc");
  TempFile real(kBeam);
  std::vector<reports::Report> beams = {beam_as(abc.path), beam_as(real.path)};
  beams.push_back(compare::check(input::parse_beam_text("{}", "bad <file>.json"), {}));
  HtmlOptions o = options();
  o.plots = false;  // plots are checked below
  o.extra_sections.push_back({"verification", "Verification record", "<p>41 cases checked</p>"});
  std::ostringstream out;
  const HtmlStats st = write_html(out, beams, o);
  const std::string h = out.str();
  EXPECT_EQ(h.rfind("<!DOCTYPE html>", 0), 0u);
  EXPECT_NE(h.find("</html>"), std::string::npos);
  // Summary first, with counts and links to every beam.
  const std::size_t summary = h.find("id=\"summary\"");
  ASSERT_NE(summary, std::string::npos);
  EXPECT_NE(h.find("<b>3</b> beams"), std::string::npos);
  EXPECT_NE(h.find("<b>1</b> invalid"), std::string::npos);
  for (std::size_t i = 0; i < beams.size(); ++i) {
    const std::string id = beam_anchor(i);
    EXPECT_NE(h.find("href=\"#" + id + "\""), std::string::npos) << id;
    const std::size_t section = h.find("id=\"" + id + "\"");
    ASSERT_NE(section, std::string::npos) << id;
    EXPECT_LT(summary, section);
  }
  EXPECT_EQ(count(h, "<section class=\"beam\""), 3u);
  // Text is escaped.
  EXPECT_NE(h.find("two spans &amp; a &lt;cantilever&gt;"), std::string::npos);
  EXPECT_NE(h.find("bad &lt;file&gt;.json"), std::string::npos);
  EXPECT_EQ(h.find("<cantilever>"), std::string::npos);
  // Per beam: verdict, node table with units, extremes, claims.
  EXPECT_NE(h.find("reaction [kN]"), std::string::npos);
  EXPECT_NE(h.find("max sagging [kN*m]"), std::string::npos);
  EXPECT_NE(h.find("<th>claimed</th>"), std::string::npos);
  EXPECT_NE(h.find("<span class=\"st fails\">fails</span>"), std::string::npos);
  EXPECT_NE(h.find("<span class=\"st holds\">holds</span>"), std::string::npos);
  EXPECT_NE(h.find("largest difference between methods"), std::string::npos);
  // The caution, the provenance.
  EXPECT_NE(h.find(html_escape(compare::caution_text())), std::string::npos);
  EXPECT_NE(h.find("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"), std::string::npos);
  EXPECT_NE(h.find(sha256_hex(kBeam)), std::string::npos);
  EXPECT_NE(h.find("(file not readable)"), std::string::npos);  // the invalid beam's made-up path
  EXPECT_NE(h.find("9.8.7"), std::string::npos);
  EXPECT_NE(h.find("2024-01-02T03:04:05Z"), std::string::npos);
  EXPECT_NE(h.find("trivet check a.json --html out.html"), std::string::npos);
  // The caller's section, after the summary, before the beams.
  const std::size_t extra = h.find("id=\"verification\"");
  ASSERT_NE(extra, std::string::npos);
  EXPECT_LT(summary, extra);
  EXPECT_LT(extra, h.find("id=\"beam-1\""));
  EXPECT_NE(h.find("<p>41 cases checked</p>"), std::string::npos);
  // Self-contained.
  for (const char* bad : {"http://", "https://", "<script", "src=", "<link", "@import"})
    EXPECT_EQ(h.find(bad), std::string::npos) << bad;
  EXPECT_EQ(st.plots, 0u);
}

TEST(Html, PlotsInline) {
  if (!find_gnuplot()) GTEST_SKIP() << "gnuplot is not installed (apt-get install gnuplot-nox): inline plots not tested";
  TempFile real(kBeam);
  std::vector<reports::Report> beams = {beam_as(real.path), beam_as(real.path)};
  std::ostringstream out;
  const HtmlStats st = write_html(out, beams, options());
  const std::string h = out.str();
  EXPECT_EQ(st.plots, 2u) << st.plot_error;
  EXPECT_EQ(count(h, "<svg"), 2u);
  EXPECT_EQ(count(h, "</svg>"), 2u);
  // Each plot sits in its own beam's section, and the ids of the two do not clash.
  const std::size_t s1 = h.find("id=\"beam-1\""), s2 = h.find("id=\"beam-2\"");
  ASSERT_NE(s1, std::string::npos);
  ASSERT_NE(s2, std::string::npos);
  const std::size_t p1 = h.find("<svg", s1);
  EXPECT_LT(p1, s2);
  EXPECT_NE(h.find("<svg", s2), std::string::npos);
  EXPECT_NE(h.find("id='b1s1-gpPt"), std::string::npos);
  EXPECT_NE(h.find("id='b2s1-gpPt"), std::string::npos);
  EXPECT_EQ(h.find("<?xml"), std::string::npos);
  for (const char* bad : {"http://", "https://", "<script", "src=", "xlink:"}) EXPECT_EQ(h.find(bad), std::string::npos) << bad;
}

TEST(Html, WithoutGnuplotSaysSoVisibly) {
  TempFile real(kBeam);
  HtmlOptions o = options();
  o.render.gnuplot = "/nonexistent/dir/gnuplot";
  std::ostringstream out;
  const HtmlStats st = write_html(out, {beam_as(real.path)}, o);
  const std::string h = out.str();
  EXPECT_EQ(st.plots, 0u);
  EXPECT_NE(st.plot_error.find("gnuplot was not found"), std::string::npos) << st.plot_error;
  EXPECT_NE(h.find("id=\"no-plots\""), std::string::npos);
  EXPECT_NE(h.find("gnuplot was not found"), std::string::npos);
  EXPECT_EQ(h.find("<svg"), std::string::npos);
  EXPECT_NE(h.find("id=\"beam-1\""), std::string::npos);  // the rest of the report is there
}

TEST(Html, ALargeLibraryPutsProblemsFirstAndFoldsTheRest) {
  TempFile real(kBeam);
  input::BeamFile good = input::parse_beam_text(R"({"units": {"force": "kN", "length": "m"}, "spans": [{"length": 4, "EI": 1000}], "supports": ["pinned", "roller"],
    "loads": [{"type": "udl", "span": 1, "w": 1}]})", real.path);
  ASSERT_TRUE(good.ok());
  const reports::Report ok = compare::check(good, {});
  ASSERT_EQ(ok.status, compare::BeamStatus::Agree);
  std::vector<reports::Report> beams(60, ok);
  beams[41] = beam_as(real.path);  // its claim fails
  beams[41].file = "the-odd-one.json";
  HtmlOptions o = options();
  o.plots = false;
  std::ostringstream out;
  write_html(out, beams, o);
  const std::string h = out.str();
  EXPECT_NE(h.find("<b>60</b> beams: <b>59</b> agree, <b>1</b> disagree"), std::string::npos);
  const std::size_t problems = h.find("Beams with a problem (1)");
  const std::size_t folded = h.find("<details><summary>Beams whose methods agree and whose checks hold (59)");
  ASSERT_NE(problems, std::string::npos);
  ASSERT_NE(folded, std::string::npos);
  const std::size_t odd = h.find("href=\"#beam-42\"");
  EXPECT_LT(problems, odd);
  EXPECT_LT(odd, folded);
  // Past 20 beams only the one that needs attention has a section of its
  // own; the others are listed in the summary, without a link to nowhere.
  EXPECT_EQ(count(h, "<section class=\"beam\""), 1u);
  EXPECT_EQ(count(h, "href=\"#beam-"), 1u);
  EXPECT_NE(h.find("every beam's detail: --html-all"), std::string::npos);
  // The 59 beams read from the file carry its hash in the provenance table.
  EXPECT_EQ(count(h, sha256_hex(kBeam)), 59u);
  // Asked for, every beam's detail.
  o.all_details = true;
  std::ostringstream all;
  write_html(all, beams, o);
  EXPECT_EQ(count(all.str(), "<section class=\"beam\""), 60u);
  EXPECT_EQ(count(all.str(), sha256_hex(kBeam)), 2u * 59u);
}

TEST(Html, PlotLimitLeavesANote) {
  TempFile real(kBeam);
  HtmlOptions o = options();
  o.max_plotted_beams = 0;
  std::ostringstream out;
  const HtmlStats st = write_html(out, {beam_as(real.path)}, o);
  EXPECT_EQ(st.plots, 0u);
  EXPECT_EQ(st.plots_skipped, 1u);
  EXPECT_NE(out.str().find("Not plotted here"), std::string::npos);
  EXPECT_EQ(out.str().find("<svg"), std::string::npos);
}

const char* kEnvelopeBeam = R"({"title": "three bays, patterned live", "units": {"force": "kN", "length": "m"},
  "spans": [{"length": 7.5, "EI": 64000}, {"length": 7.5, "EI": 64000}, {"length": 7.5, "EI": 64000}],
  "supports": ["pinned", "roller", "roller", "roller"],
  "loads": [{"type": "udl", "span": 1, "w": 14.0, "case": "dead"}, {"type": "udl", "span": 2, "w": 14.0, "case": "dead"},
            {"type": "udl", "span": 3, "w": 14.0, "case": "dead"}, {"type": "udl", "span": 1, "w": 9.0, "case": "live"},
            {"type": "udl", "span": 2, "w": 9.0, "case": "live"}, {"type": "udl", "span": 3, "w": 9.0, "case": "live"}],
  "combinations": [{"name": "strength-A", "factors": {"dead": 1.2, "live": 1.6}, "pattern": ["live"]}]})";

TEST(Html, WarningsEnvelopeTablesAndAgainstSummary) {
  TempFile env_file(kEnvelopeBeam);
  TempFile plain_file(kBeam);
  input::BeamFile ef = input::parse_beam_text(kEnvelopeBeam, env_file.path);
  ASSERT_TRUE(ef.ok());
  reports::Report env = compare::check(ef, {});
  const compare::LoadSet* set = nullptr;
  for (const auto& s : env.sets)
    if (s.name == "strength-A") set = &s;
  ASSERT_NE(set, nullptr);
  ASSERT_TRUE(set->envelope);
  ASSERT_EQ(set->consensus_envelope.reaction.size(), 4u);
  env.warnings.push_back("double may lose about 10 of its 16 digits <here>");
  input::BeamFile pf = input::parse_beam_text(kBeam, plain_file.path);
  reports::Report plain = compare::check(pf, {});
  auto cmp = std::make_shared<compare::against::Comparison>(
      compare::against::compare_text(pf, plain, "support,force\nB,12345\nC,0\n", "their-reactions.csv", {}));
  ASSERT_TRUE(cmp->ok());
  plain.against.push_back(cmp);
  HtmlOptions o = options();
  o.plots = false;
  std::ostringstream out;
  write_html(out, {plain, env}, o);
  const std::string h = out.str();
  // The warning, escaped, in the beam's section, and the beam marked in the summary.
  const std::size_t section = h.find("id=\"beam-2\"");
  ASSERT_NE(section, std::string::npos);
  const std::size_t warning = h.find("double may lose about 10 of its 16 digits &lt;here&gt;");
  ASSERT_NE(warning, std::string::npos);
  EXPECT_GT(warning, section);
  const std::size_t summary_end = h.find("</section>", h.find("id=\"summary\""));
  const std::size_t mark = h.find("1 warning</span>");
  ASSERT_NE(mark, std::string::npos);
  EXPECT_LT(mark, summary_end);
  EXPECT_EQ(count(h, "1 warning</span>"), 1u) << "only the beam with a warning is marked";
  EXPECT_NE(h.find("id=\"summary-warnings\""), std::string::npos);
  // Envelope tables: a reaction row per support with max, min and what
  // governs; a row per span with the extremes.
  const std::size_t rt = h.find("<table class=\"envelope-reactions\">");
  ASSERT_NE(rt, std::string::npos);
  const std::string reactions = h.substr(rt, h.find("</table>", rt) - rt);
  EXPECT_EQ(count(reactions, "<tr><td>"), 4u);
  EXPECT_NE(reactions.find("loaded; dead x1.2, live x1.6"), std::string::npos) << reactions;
  const int dr = decimals_for(set->scale[static_cast<std::size_t>(compare::Kind::Reaction)]);
  EXPECT_NE(reactions.find(">" + fixed(set->consensus_envelope.reaction[1].max, dr) + "<"), std::string::npos);
  EXPECT_NE(reactions.find(">" + fixed(set->consensus_envelope.reaction[1].min, dr) + "<"), std::string::npos);
  const std::size_t et = h.find("<table class=\"envelope-extremes\">");
  ASSERT_NE(et, std::string::npos);
  const std::string extremes = h.substr(et, h.find("</table>", et) - et);
  EXPECT_EQ(count(extremes, "<tr><td>"), 3u);
  EXPECT_NE(extremes.find(set->extremes[0].max_moment_by), std::string::npos);
  EXPECT_NE(h.find("1.2 &times; dead + 1.6 &times; live"), std::string::npos);
  // The --against summary: quantity, rows, failing, worst difference, finding.
  const std::size_t at = h.find("<table class=\"against\">");
  ASSERT_NE(at, std::string::npos);
  EXPECT_LT(at, section) << "in the first beam's section";
  EXPECT_NE(h.find("their-reactions.csv"), std::string::npos);
  const std::string row = h.substr(at, h.find("</table>", at) - at);
  EXPECT_NE(row.find("<tr><td>reaction</td><td class=\"n\">2</td><td class=\"n\">"), std::string::npos) << row;
  ASSERT_FALSE(cmp->summary.empty());
  EXPECT_GT(cmp->summary[0].failing, 0u);
  EXPECT_NE(row.find("<td class=\"n\">" + std::to_string(cmp->summary[0].failing) + "</td>"), std::string::npos);
}

TEST(Html, SvgForHtml) {
  const std::string svg =
      "<?xml version=\"1.0\"?>\n<!DOCTYPE svg>\n<svg width=\"10\" xmlns=\"http://www.w3.org/2000/svg\" "
      "xmlns:xlink=\"http://www.w3.org/1999/xlink\">\n\t<defs><path id='gpPt1'/></defs>\n"
      "\t<use xlink:href='#gpPt1'/>\n<g id=\"a\" clip-path=\"url(#a)\"></g>\n</svg>\n";
  const std::string s = svg_for_html(svg, "p-");
  EXPECT_EQ(s.rfind("<svg", 0), 0u);
  EXPECT_EQ(s.find("http"), std::string::npos);
  EXPECT_EQ(s.find("xlink"), std::string::npos);
  EXPECT_NE(s.find("id='p-gpPt1'"), std::string::npos);
  EXPECT_NE(s.find("href='#p-gpPt1'"), std::string::npos);
  EXPECT_NE(s.find("url(#p-a)"), std::string::npos);
  EXPECT_NE(s.find("</svg>"), std::string::npos);
  EXPECT_EQ(s.find('\t'), std::string::npos);
  EXPECT_TRUE(svg_for_html("not a picture", "x").empty());
}

TEST(Html, UtcDate) {
  const std::string d = utc_now_iso8601();
  ASSERT_EQ(d.size(), 20u);
  EXPECT_EQ(d[4], '-');
  EXPECT_EQ(d[10], 'T');
  EXPECT_EQ(d.back(), 'Z');
}

}  // namespace
}  // namespace trivet::reports

namespace trivet::reports {
namespace {

// The checking record of one beam: its file and SHA-256, the tool and date,
// blank fields for the project and the checker, the result, the governing
// values (here the fixed end's hogging moment, which the node table also
// shows), the claims with their verdicts, the detail and the caution; a
// print style that keeps headings with what follows; nothing fetched.
TEST(Record, OnePrintablePageWithTheGoverningValuesAndBlankFields) {
  TempFile file(kBeam);
  const Report b = beam_as(file.path);
  ASSERT_NE(b.status, compare::BeamStatus::Invalid);
  std::ostringstream out;
  HtmlOptions o = options();
  o.plots = false;
  write_record(out, b, o);
  const std::string html = out.str();
  EXPECT_NE(html.find("Checking record: two spans &amp; a &lt;cantilever&gt;"), std::string::npos);
  const auto sha = sha256_file(file.path);
  ASSERT_TRUE(sha);
  EXPECT_NE(html.find(*sha), std::string::npos);
  EXPECT_NE(html.find("trivet 9.8.7, 2024-01-02T03:04:05Z"), std::string::npos) << html.substr(0, 2000);
  for (const char* field : {">project<", ">checked by<", ">date<", ">signature<"})
    EXPECT_NE(html.find(field), std::string::npos) << field;
  EXPECT_EQ(count(html, "class=\"blank\""), 4u);
  EXPECT_GE(count(html, compare::caution_text()), 2u);
  // The governing values: the hogging moment at the fixed end A equals the
  // consensus node value, to the digits shown.
  const auto& set = b.sets.front();
  ASSERT_TRUE(set.consensus_nodes.front().moment_right);
  double hog = 0;
  for (const auto& e : set.extremes) hog = std::min(hog, e.min_moment);
  ASSERT_LT(hog, 0);
  const std::size_t gov = html.find("<h2>Governing values</h2>");
  ASSERT_NE(gov, std::string::npos);
  const std::size_t row = html.find("largest hogging moment [kN*m]", gov);
  ASSERT_NE(row, std::string::npos);
  const std::string cell = "<td class=\"n\">";
  const std::size_t at = html.find(cell, row);
  ASSERT_NE(at, std::string::npos);
  const std::string shown = html.substr(at + cell.size(), html.find('<', at + cell.size()) - at - cell.size());
  const std::size_t dot = shown.find('.');
  const int decimals = dot == std::string::npos ? 0 : static_cast<int>(shown.size() - dot - 1);
  // The value shown is the hogging moment rounded to the digits shown.
  EXPECT_LE(std::abs(std::stod(shown) - hog), 0.5 * std::pow(10.0, -decimals) + 1e-12) << shown << " for " << hog;
  EXPECT_NE(html.find("reaction moment at node A"), std::string::npos);
  // Claims: the record says how many fail, and shows each.
  EXPECT_NE(html.find(std::to_string(b.claims_failed()) + " of 2 claims fail"), std::string::npos);
  EXPECT_NE(html.find("<h3>Claims"), std::string::npos);
  // Print: headings kept with what follows, tables and plots not split.
  EXPECT_NE(html.find("break-after:avoid"), std::string::npos);
  EXPECT_NE(html.find("break-inside:avoid"), std::string::npos);
  EXPECT_EQ(html.find("<script"), std::string::npos);
  EXPECT_EQ(html.find("http://"), std::string::npos);
  EXPECT_EQ(html.find("https://"), std::string::npos);
}

TEST(Record, FileNamesKeepTheFoldersApart) {
  EXPECT_EQ(record_file_name("examples/core-wall-beam.json"), "examples-core-wall-beam.html");
  EXPECT_EQ(record_file_name("./lib/a/beam.json"), "lib-a-beam.html");
  EXPECT_EQ(record_file_name("lib/b/beam.json"), "lib-b-beam.html");
  EXPECT_EQ(record_file_name("/abs/x.json"), "abs-x.html");
  EXPECT_EQ(record_file_name("noext"), "noext.html");
}

}  // namespace
}  // namespace trivet::reports

namespace trivet::reports {
namespace {

// A span whose largest moment is rounding (the overhang of this beam: its
// largest "sagging" moment is 2.8e-14 kN*m, at the free end, where the
// moment is 0 in exact arithmetic) has no sagging: "-" in the console's and
// the HTML report's span tables and "none" among a record's governing
// values, never "0.00" at some point in one and "-" in another. (Invented
// numbers, chosen for that rounding.)
TEST(SpanTables, SaggingBelowRoundingIsNoneEverywhere) {
  input::BeamFile f = input::parse_beam_text(R"({"title": "overhang", "units": {"force": "kN", "length": "m"},
    "spans": [{"length": 6.3, "EI": 30000}, {"length": 4.1, "EI": 30000}], "supports": ["fixed", "roller", "free"],
    "loads": [{"type": "udl", "span": 1, "w": 7.3}, {"type": "udl", "span": 2, "w": 11.1},
              {"type": "point", "span": 2, "P": 3.3, "at": 1.7}]})", "overhang.json");
  ASSERT_TRUE(f.ok());
  const Report b = compare::check(f, {});
  ASSERT_EQ(b.sets.size(), 1u);
  const double noise = b.sets[0].extremes[1].max_moment;
  ASSERT_LT(std::abs(noise), 1e-12 * b.sets[0].scale[static_cast<int>(compare::Kind::Moment)]);
  EXPECT_FALSE(is_sagging(b.sets[0], noise));
  std::ostringstream console;
  write_console(console, b, {});
  // "  2  -  <blank>  -98.9 ...": the span's row with no sagging value.
  const std::string c = console.str();
  const auto row = c.find("\n  2 ", c.find("max sagging"));
  ASSERT_NE(row, std::string::npos) << c;
  const std::string line = c.substr(row + 1, c.find('\n', row + 1) - row - 1);
  std::istringstream words(line);
  std::string span, first;
  words >> span >> first;
  EXPECT_EQ(first, "-") << line;
  std::ostringstream html;
  write_html(html, {b}, options());
  const std::string h = html.str();
  const auto hrow = h.find("<tr><td>2</td>", h.find("max sagging"));
  ASSERT_NE(hrow, std::string::npos);
  EXPECT_EQ(h.compare(hrow, 37, "<tr><td>2</td><td class=\"n\">-</td><td"), 0) << h.substr(hrow, 80);
}

}  // namespace
}  // namespace trivet::reports
