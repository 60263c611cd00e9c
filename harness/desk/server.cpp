// trivet desk: the HTTP server (cpp-httplib). See server.h and docs/desk-api.md.
#include "harness/desk/server.h"

#include <algorithm>
#include <atomic>
#include <cctype>
#include <cerrno>
#include <chrono>
#include <condition_variable>
#include <csignal>
#include <cstring>
#include <fstream>
#include <iostream>
#include <memory>
#include <mutex>
#include <sstream>
#include <thread>
#include <vector>

#include <fcntl.h>
#include <pthread.h>
#include <spawn.h>
#include <sys/socket.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <httplib.h>
#include <nlohmann/json.hpp>

#include "harness/cli/files.h"
#include "harness/desk/desk_page.h"
#include "harness/input/reader.h"
#include "harness/input/units.h"
#include "reports/plot.h"

extern char** environ;

namespace trivet::desk {

namespace {

using json = nlohmann::json;

// Reads a whole regular file of at most `limit` bytes. Nothing (and the
// reason in *why) for anything else.
std::optional<std::string> read_small_file(const std::string& path, std::size_t limit, std::string* why) {
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC | O_NONBLOCK | O_NOCTTY);
  if (fd < 0) {
    *why = std::string("cannot open it (") + std::strerror(errno) + ")";
    return std::nullopt;
  }
  struct stat st{};
  if (::fstat(fd, &st) != 0 || !S_ISREG(st.st_mode)) {
    ::close(fd);
    *why = "it is not a regular file";
    return std::nullopt;
  }
  if (static_cast<std::uint64_t>(st.st_size) > limit) {
    ::close(fd);
    *why = "it is larger than the desk's limit of " + std::to_string(limit >> 20) +
           " MiB (check it with `trivet check`)";
    return std::nullopt;
  }
  std::string text;
  char buf[65536];
  for (;;) {
    const ssize_t n = ::read(fd, buf, sizeof buf);
    if (n < 0 && errno == EINTR) continue;
    if (n < 0) {
      ::close(fd);
      *why = std::string("cannot read it (") + std::strerror(errno) + ")";
      return std::nullopt;
    }
    if (n == 0) break;
    text.append(buf, static_cast<std::size_t>(n));
    if (text.size() > limit) {
      ::close(fd);
      *why = "it is larger than the desk's limit of " + std::to_string(limit >> 20) + " MiB";
      return std::nullopt;
    }
  }
  ::close(fd);
  return text;
}

// A UTF-8 byte order mark at the start, which JSON text may not carry inside
// another document.
std::string without_bom(std::string s) {
  if (s.size() >= 3 && s.compare(0, 3, "\xEF\xBB\xBF") == 0) s.erase(0, 3);
  return s;
}

// The text is one JSON object (duplicate keys and all: the reader judges
// those; this only decides whether the text can sit inside a response).
bool is_json_object(const std::string& text) {
  if (!json::accept(text)) return false;
  const auto first = text.find_first_not_of(" \t\r\n");
  return first != std::string::npos && text[first] == '{';
}

std::string lower(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

bool is_loopback_name(const std::string& host) {
  const std::string h = lower(host);
  return h == "127.0.0.1" || h == "localhost" || h == "::1" || h == "[::1]";
}

std::string url_host(const std::string& host) {
  return host.find(':') != std::string::npos && host.front() != '[' ? "[" + host + "]" : host;
}

const char* kJson = "application/json; charset=utf-8";

// The largest beam the desk draws: gnuplot takes about 2 ms a support or
// load for the sketch (a 3,000-span beam: 8 s a load set), and a drawing
// holds a check slot meanwhile. "" or why a load set is not drawn.
constexpr std::size_t kMostDrawn = 1000;
std::string too_big_to_draw(const reports::PlotData& data) {
  const std::size_t n = data.nodes.size() + data.loads.size();
  if (n <= kMostDrawn) return "";
  return "not drawn in the desk: " + std::to_string(data.nodes.size()) + " nodes and " + std::to_string(data.loads.size()) +
         " loads (it draws up to " + std::to_string(kMostDrawn) + " together); `trivet plot FILE -o OUT.svg` draws any beam";
}

// Checks that may run at once (/api/check, /api/view, /api/report.html);
// the pool has more workers than this, for everything else.
constexpr int kCheckSlots = 3;
constexpr int kWorkers = 12;

// Sends `text` as the body without a copy and uncompressed (the library
// would compress a plain body for a client that accepts it: slow for a long
// beam's report, and of no use on this computer's loopback).
void send(httplib::Response& res, std::string text, const std::string& type) {
  auto data = std::make_shared<const std::string>(std::move(text));
  res.set_content_provider(data->size(), type, [data](std::size_t offset, std::size_t length, httplib::DataSink& sink) {
    if (offset >= data->size()) return true;
    return sink.write(data->data() + offset, std::min(length, data->size() - offset));
  });
}

// The server and what its handlers share.
class Desk {
 public:
  Desk(const Options& o, const Backend& b) : opt_(o), back_(b) {}

  int run();

 private:
  // The name a posted beam is reported under: FILE when the body is FILE's
  // content as it is on disk; otherwise a name that says the beam is not a
  // saved file (so no report states a file's hash for bytes it does not hold).
  std::string name_for(const std::string& body) const {
    if (opt_.file.empty()) return "new beam (not saved)";
    std::string why;
    struct stat st{};
    if (::stat(opt_.file.c_str(), &st) == 0 && S_ISREG(st.st_mode) &&
        static_cast<std::uint64_t>(st.st_size) == body.size()) {
      const auto on_disk = read_small_file(opt_.file, opt_.max_body, &why);
      if (on_disk && *on_disk == body) return opt_.file;
    }
    return opt_.file + " (edited, not saved)";
  }

  // The check of `trivet check`, with an internal failure made a report
  // carrying it (as `trivet check` reports one); `failed` says so.
  reports::Report check(const std::string& body, bool* failed) const {
    const std::string name = name_for(body);
    *failed = false;
    try {
      return back_.check(body, name);
    } catch (const std::bad_alloc&) {
      *failed = true;
      reports::Report r;
      r.file = name;
      r.errors.push_back({"", "", "internal failure: out of memory while checking this beam", "internal.out_of_memory"});
      return r;
    } catch (const std::exception& e) {
      *failed = true;
      reports::Report r;
      r.file = name;
      r.errors.push_back({"", "", std::string("internal error while checking: ") + e.what(), "internal.error"});
      return r;
    }
  }

  // The JSON report of `trivet check --json` for one beam: its JSON
  // reporter, driven as the check command drives it for one file.
  std::string json_report(const reports::Report& r) const {
    std::ostringstream out;
    auto rep = reports::json_reporter({&out, false});
    rep->begin(back_.run);
    rep->keep(r);
    reports::Summary s;
    s.add(r.status, r.claims_failed(), r.limits_failed());
    if (const std::string err = rep->end(s); !err.empty()) throw std::runtime_error("JSON report: " + err);
    return out.str();
  }

  std::string console_text(const reports::Report& r) const {
    std::ostringstream out;
    reports::ConsoleOptions co = back_.console;
    co.color = false;
    auto rep = reports::console_reporter(out, co, false);
    rep->begin(back_.run);
    rep->keep(r);
    reports::Summary s;
    s.add(r.status, r.claims_failed(), r.limits_failed());
    rep->end(s);
    return out.str();
  }

  // The plots of the HTML report, one per load set: the same data, thinning,
  // size and SVG clean-up as reports/html_report.cpp's diagrams.
  json plots(const reports::Report& r) const {
    json list = json::array();
    if (r.status == compare::BeamStatus::Invalid) return list;
    const reports::HtmlOptions& ho = back_.html;
    for (std::size_t si = 0; si < r.sets.size(); ++si) {
      reports::RenderOptions ro = ho.render;
      ro.format = reports::ImageFormat::Svg;
      ro.width = ho.plot_width;
      ro.height = ho.plot_height;
      reports::PlotData data = reports::plot_data(r, si, ho.show);
      json p = {{"load_set", r.sets[si].name}};
      if (const std::string why = too_big_to_draw(data); !why.empty()) {
        p["svg"] = "";
        p["error"] = why;
        p["notes"] = json::array();
        list.push_back(std::move(p));
        continue;
      }
      data = reports::thinned(data, ho.max_points);
      data.agreement = ho.agreement;
      std::string err;
      const std::string svg = reports::render(data, ro, &err);
      if (svg.empty()) {
        p["svg"] = "";
        p["error"] = err;
      } else {
        p["svg"] = reports::svg_for_html(svg, "s" + std::to_string(si + 1) + "-");
      }
      p["notes"] = data.notes;
      list.push_back(std::move(p));
    }
    return list;
  }

  void handle_check(const std::string& body_in, httplib::Response& res) {
    bool failed = false;
    const reports::Report r = check(body_in, &failed);
    res.status = failed ? 500 : r.status == compare::BeamStatus::Invalid ? 400 : 200;
    send(res, json_report(r), kJson);
  }

  void handle_view(const std::string& body_in, httplib::Response& res) {
    bool failed = false;
    const reports::Report r = check(body_in, &failed);
    res.status = failed ? 500 : r.status == compare::BeamStatus::Invalid ? 400 : 200;
    // The check's JSON report as it is, inside the answer.
    std::string body = "{\"report\": " + json_report(r);
    body += ", \"plots\": " + plots(r).dump(-1, ' ', false, json::error_handler_t::replace);
    body += ", \"console\": " + json(console_text(r)).dump(-1, ' ', false, json::error_handler_t::replace);
    // The units a person reads (as the console and the diagrams show
    // them): each kind's label and the factor from the file's unit.
    if (r.status != compare::BeamStatus::Invalid) {
      const reports::DisplayUnits u = reports::display_units(r.units, back_.console.show);
      auto unit = [](const reports::DisplayUnit& d) { return json{{"label", d.label}, {"factor", d.factor}}; };
      const json display = {{"force", unit(u.force)}, {"moment", unit(u.moment)}, {"length", unit(u.length)},
                            {"deflection", unit(u.deflection)}, {"rotation", unit(u.rotation)}};
      body += ", \"display\": " + display.dump(-1, ' ', false, json::error_handler_t::replace);
    }
    body += "}\n";
    send(res, body, kJson);
  }

  void handle_report(const std::string& body_in, httplib::Response& res) {
    bool failed = false;
    const reports::Report r = check(body_in, &failed);
    if (failed || r.status == compare::BeamStatus::Invalid) {
      res.status = failed ? 500 : 400;
      send(res, json_report(r), kJson);
      return;
    }
    std::ostringstream out;
    reports::HtmlOptions ho = back_.html;
    for (std::size_t si = 0; si < r.sets.size(); ++si)
      if (const std::string why = too_big_to_draw(reports::plot_data(r, si, ho.show)); !why.empty()) {
        ho.plots = false;
        ho.extra_sections.push_back({"desk-diagrams", "Diagrams", "<p class=\"note\">No diagrams in this report: " +
                                                                     reports::html_escape(why) + ".</p>"});
        break;
      }
    auto rep = reports::html_reporter(out, ho);
    rep->begin(back_.run);
    rep->keep(r);
    reports::Summary s;
    s.add(r.status, r.claims_failed(), r.limits_failed());
    if (const std::string err = rep->end(s); !err.empty()) throw std::runtime_error("HTML report: " + err);
    if (const std::string note = rep->warning(); !note.empty()) std::cerr << "trivet desk: HTML report: " << note << "\n";
    std::string base = opt_.file;
    if (const auto slash = base.find_last_of('/'); slash != std::string::npos) base.erase(0, slash + 1);
    if (base.size() > 5 && base.compare(base.size() - 5, 5, ".json") == 0) base.erase(base.size() - 5);
    const std::string name = download_name(r.title, base.empty() ? "beam" : base, ".html");
    res.set_header("Content-Disposition", "attachment; filename=\"" + name + "\"");
    send(res, out.str(), "text/html; charset=utf-8");
  }

  void handle_save(const std::string& body_in, httplib::Response& res) {
    if (opt_.file.empty()) {
      res.status = 409;
      const json why = {{"error", "the desk was started without a FILE, so there is nothing to save to; "
                                  "download the beam file instead, or start it as `trivet desk FILE`"}};
      send(res, why.dump() + "\n", kJson);
      return;
    }
    if (!is_json_object(without_bom(body_in))) {
      // Not JSON (or not an object): the reader's located errors, as /api/check gives them.
      input::BeamFile f = input::parse_beam_text(body_in, name_for(body_in));
      reports::Report bad;
      bad.file = f.path;
      bad.errors = f.errors;
      if (bad.errors.empty()) bad.errors.push_back({"", "", "a beam file is a JSON object", "input.syntax"});
      res.status = 400;
      send(res, json_report(bad), kJson);
      return;
    }
    std::lock_guard<std::mutex> lock(save_mutex_);
    if (const std::string why = cli::report_targets_problem({{"FILE", opt_.file}}); !why.empty()) {
      res.status = 409;
      send(res, json{{"error", "cannot save: " + why}}.dump() + "\n", kJson);
      return;
    }
    const std::string err = cli::write_report_file(opt_.file, [&](std::ostream& o) { o << body_in; });
    if (!err.empty()) {
      res.status = 500;
      send(res, json{{"error", "cannot save " + opt_.file + ": " + err}}.dump() + "\n", kJson);
      return;
    }
    send(res, json{{"saved", opt_.file}}.dump() + "\n", kJson);
  }

  void handle_start(httplib::Response& res) const {
    std::string beam = back_.starter;
    std::optional<std::string> file_text;
    if (!opt_.file.empty() && ::access(opt_.file.c_str(), F_OK) == 0) {
      std::string why;
      const auto text = read_small_file(opt_.file, opt_.max_body, &why);
      if (!text) {
        res.status = 500;
        send(res, json{{"error", "cannot read " + opt_.file + ": " + why}}.dump() + "\n", kJson);
        return;
      }
      file_text = *text;
      beam = without_bom(*text);
      if (!is_json_object(beam)) {
        res.status = 500;
        send(res, json{{"error", opt_.file + " is no longer a JSON object; fix it in an editor"}}.dump() + "\n", kJson);
        return;
      }
    }
    json forces = json::array(), lengths = json::array();
    for (const auto& u : input::unit_symbols()) {
      if (input::force_unit(u.symbol)) forces.push_back(u.symbol);
      if (input::length_unit(u.symbol)) lengths.push_back(u.symbol);
    }
    const bool writable = !opt_.file.empty() && cli::report_targets_problem({{"FILE", opt_.file}}).empty();
    // The file's text as it is (its key order and numbers), inside the answer.
    std::string body = "{\"file\": " + (opt_.file.empty() ? std::string("null") : json(opt_.file).dump(-1, ' ', false, json::error_handler_t::replace));
    body += ", \"writable\": " + std::string(writable ? "true" : "false");
    body += ", \"beam\": " + beam;
    // And its bytes as a string: posted back unchanged, they are FILE itself.
    if (file_text) body += ", \"text\": " + json(*file_text).dump(-1, ' ', false, json::error_handler_t::replace);
    body += ", \"forces\": " + forces.dump() + ", \"lengths\": " + lengths.dump() + "}\n";
    send(res, body, kJson);
  }

  std::string address() const { return "http://" + url_host(opt_.host) + ":" + std::to_string(port_) + "/"; }

  void open_browser() const;

  const Options& opt_;
  const Backend& back_;
  int port_ = 0;
  std::mutex save_mutex_;
  std::atomic<int> busy_{0};  // checks running
};

void Desk::open_browser() const {
  // Its own process group and no blocked signals: Ctrl-C in this terminal
  // and the desk's blocked SIGINT do not reach the browser.
  posix_spawnattr_t attr;
  posix_spawnattr_init(&attr);
  sigset_t none;
  sigemptyset(&none);
  posix_spawnattr_setsigmask(&attr, &none);
  posix_spawnattr_setpgroup(&attr, 0);
  posix_spawnattr_setflags(&attr, POSIX_SPAWN_SETSIGMASK | POSIX_SPAWN_SETPGROUP);
  const std::string url = address();
  char prog[] = "xdg-open";
  std::vector<char> arg(url.begin(), url.end());
  arg.push_back('\0');
  char* argv[] = {prog, arg.data(), nullptr};
  pid_t pid = 0;
  const int rc = posix_spawnp(&pid, "xdg-open", nullptr, &attr, argv, environ);
  posix_spawnattr_destroy(&attr);
  if (rc != 0) {
    std::cerr << "trivet desk: --open: cannot run xdg-open (" << std::strerror(rc) << "); open " << url << " yourself\n";
    return;
  }
  std::thread([pid] {
    int status = 0;
    while (::waitpid(pid, &status, 0) < 0 && errno == EINTR) {}
  }).detach();
}

int Desk::run() {
  // SIGINT and SIGTERM are taken by one thread with sigwait(): blocked here,
  // before any thread starts, so every thread inherits the mask.
  sigset_t stop_signals;
  sigemptyset(&stop_signals);
  sigaddset(&stop_signals, SIGINT);
  sigaddset(&stop_signals, SIGTERM);
  pthread_sigmask(SIG_BLOCK, &stop_signals, nullptr);

  httplib::Server svr;
  // A pool of workers: a slow check holds one, the others answer.
  svr.new_task_queue = [] { return new httplib::ThreadPool(kWorkers); };
  svr.set_payload_max_length(opt_.max_body);
  // SO_REUSEADDR only: the library's default also sets SO_REUSEPORT, with
  // which a second desk (or another program of this user) could listen on
  // the same port and take part of the requests.
  svr.set_socket_options([](int sock) {
    int yes = 1;
    ::setsockopt(sock, SOL_SOCKET, SO_REUSEADDR, &yes, sizeof yes);
  });
  // Idle keep-alive connections hold a worker; let them go soon (and let a
  // stop finish within about a second).
  svr.set_keep_alive_timeout(1);
  svr.set_read_timeout(30);
  svr.set_write_timeout(30);
  svr.set_default_headers({
      {"Cache-Control", "no-store"},
      {"X-Content-Type-Options", "nosniff"},
      {"X-Frame-Options", "DENY"},
      {"Referrer-Policy", "no-referrer"},
      {"Cross-Origin-Resource-Policy", "same-origin"},
  });

  svr.set_pre_routing_handler([this](const httplib::Request& req, httplib::Response& res) {
    const std::string host = req.get_header_value("Host");
    if (!host_allowed(host, opt_.host, port_)) {
      res.status = 403;
      res.set_header("Connection", "close");
      res.set_content("trivet desk: refused: the request's Host is '" + host + "'; the desk answers only to " +
                          "127.0.0.1:" + std::to_string(port_) + ", localhost:" + std::to_string(port_) + " and [::1]:" +
                          std::to_string(port_) + "\n",
                      "text/plain; charset=utf-8");
      return httplib::Server::HandlerResponse::Handled;
    }
    // A page of another site can send a POST to this address (its Host is
    // then right): a browser names the page's origin, which must be the
    // desk's own. Programs that send no Origin (curl, scripts) run on this
    // computer and could write FILE anyway.
    if (req.method != "GET" && req.method != "HEAD") {
      const std::string site = lower(req.get_header_value("Sec-Fetch-Site"));
      const bool foreign_origin = req.has_header("Origin") && !origin_allowed(req.get_header_value("Origin"), opt_.host, port_);
      if (foreign_origin || (!site.empty() && site != "same-origin" && site != "none")) {
        res.status = 403;
        res.set_header("Connection", "close");
        res.set_content("trivet desk: refused: a request from another site's page (Origin '" + req.get_header_value("Origin") +
                            "'); only the desk's own page may send it\n",
                        "text/plain; charset=utf-8");
        return httplib::Server::HandlerResponse::Handled;
      }
    }
    // Bodies come whole with their length: a chunked body would pass the
    // size limit unseen in this version of the library, a compressed one
    // could grow past it when inflated.
    if (req.has_header("Transfer-Encoding") || (req.method == "POST" && !req.has_header("Content-Length"))) {
      res.status = 411;
      res.set_header("Connection", "close");
      res.set_content("trivet desk: send the body whole, with a Content-Length (no Transfer-Encoding)\n", "text/plain; charset=utf-8");
      return httplib::Server::HandlerResponse::Handled;
    }
    if (req.has_header("Content-Encoding") && lower(req.get_header_value("Content-Encoding")) != "identity") {
      res.status = 415;
      res.set_header("Connection", "close");
      res.set_content("trivet desk: send the body uncompressed (no Content-Encoding)\n", "text/plain; charset=utf-8");
      return httplib::Server::HandlerResponse::Handled;
    }
    return httplib::Server::HandlerResponse::Unhandled;
  });
  svr.set_error_handler([this](const httplib::Request&, httplib::Response& res) {
    if (!res.body.empty() || res.has_header("Content-Type")) return;  // a body of ours
    std::string why = res.status == 400 ? "bad request" : res.status == 405 ? "method not allowed"
                      : res.status == 414 ? "the address is too long" : res.status == 500 ? "internal error"
                      : "refused";
    if (res.status == 413) why = "the request body is larger than the desk's limit of " + std::to_string(opt_.max_body >> 20) + " MiB";
    if (res.status == 404) why = "no such page (the desk has /, /api/start, /api/check, /api/view, /api/report.html and /api/save)";
    res.set_content("trivet desk: " + std::to_string(res.status) + ": " + why + "\n", "text/plain; charset=utf-8");
  });
  svr.set_exception_handler([](const httplib::Request& req, httplib::Response& res, std::exception_ptr ep) {
    std::string what = "unknown";
    try {
      if (ep) std::rethrow_exception(ep);
    } catch (const std::exception& e) {
      what = e.what();
    } catch (...) {
    }
    std::cerr << "trivet desk: internal error on " << req.method << " " << req.path << ": " << what << "\n";
    res.status = 500;
    res.set_content(json{{"error", "internal error: " + what}}.dump(-1, ' ', false, json::error_handler_t::replace) + "\n", kJson);
  });

  svr.Get("/", [](const httplib::Request&, httplib::Response& res) {
    res.set_header("Content-Security-Policy",
                   "default-src 'none'; script-src 'unsafe-inline'; style-src 'unsafe-inline'; img-src data: blob:; "
                   "connect-src 'self'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'");
    send(res, std::string(reinterpret_cast<const char*>(page::kBytes), page::kSize), "text/html; charset=utf-8");
  });
  svr.Get("/api/start", [this](const httplib::Request&, httplib::Response& res) { handle_start(res); });
  // The bodies are read here, not by the library: it would take a form's
  // content type (curl's default) as a form and refuse one over 8 KiB.
  // A check holds one of the check slots; when all are taken the answer is
  // 503 at once, so checks can never hold every worker.
  auto post = [this, &svr](const std::string& path, bool is_check, void (Desk::*handle)(const std::string&, httplib::Response&)) {
    svr.Post(path, [this, is_check, handle](const httplib::Request&, httplib::Response& res, const httplib::ContentReader& reader) {
      std::string body;
      bool too_big = false;
      const bool read = reader([&](const char* data, std::size_t n) {
        if (body.size() + n > opt_.max_body) {
          too_big = true;
          return false;
        }
        body.append(data, n);
        return true;
      });
      if (!read || too_big) {
        res.status = too_big || res.status == 413 ? 413 : 400;
        return;
      }
      if (!is_check) {
        (this->*handle)(body, res);
        return;
      }
      if (busy_.fetch_add(1) >= kCheckSlots) {
        busy_.fetch_sub(1);
        res.status = 503;
        res.set_header("Retry-After", "1");
        send(res, json{{"error", "busy: " + std::to_string(kCheckSlots) + " checks are running; try again when one has ended"}}.dump() + "\n", kJson);
        return;
      }
      struct Release {
        std::atomic<int>& n;
        ~Release() { n.fetch_sub(1); }
      } release{busy_};
      (this->*handle)(body, res);
    });
  };
  post("/api/check", true, &Desk::handle_check);
  post("/api/view", true, &Desk::handle_view);
  post(R"(/api/report\.html)", true, &Desk::handle_report);
  post("/api/save", false, &Desk::handle_save);

  if (opt_.port == 0) {
    port_ = svr.bind_to_any_port(opt_.host);
  } else {
    port_ = svr.bind_to_port(opt_.host, opt_.port) ? opt_.port : -1;
  }
  if (port_ <= 0) {
    std::cerr << "trivet desk: cannot listen on " << url_host(opt_.host) << ":" << opt_.port
              << (opt_.port ? " (in use? try --port 0 for any free port)" : "") << "\n";
    return 2;
  }
  std::cout << "trivet desk: " << address() << std::endl;
  std::cerr << "trivet desk: " << (opt_.file.empty() ? std::string("a new beam") : opt_.file)
            << "; Ctrl-C stops the desk\n";
  if (!is_loopback_name(opt_.host))
    std::cerr << "trivet desk: warning: listening on " << opt_.host
              << ", not only this computer's loopback address: others on the network can use the desk\n";
  if (opt_.open) open_browser();

  // The stop: the first SIGINT or SIGTERM stops the server (the workers
  // finish the requests they hold); if they have not within 10 s, or a
  // second signal comes, the program ends anyway. Reports and saves are
  // written whole or not at all, so nothing is left half written.
  std::mutex m;
  std::condition_variable cv;
  bool done = false;
  std::atomic<bool> listen_ended{false};
  std::thread waiter([&] {
    int sig = 0;
    sigwait(&stop_signals, &sig);
    if (listen_ended) return;  // woken by the main thread: nothing to stop
    std::cerr << "trivet desk: stopping\n";
    bool stopped = false;
    const auto deadline = std::chrono::steady_clock::now() + std::chrono::seconds(10);
    std::unique_lock<std::mutex> lock(m);
    while (!done) {
      if (!stopped && svr.is_running()) {
        svr.stop();
        stopped = true;
      }
      if (cv.wait_for(lock, std::chrono::milliseconds(50), [&] { return done; })) break;
      sigset_t pending;
      sigpending(&pending);
      if (std::chrono::steady_clock::now() > deadline || sigismember(&pending, SIGINT) || sigismember(&pending, SIGTERM)) {
        const char msg[] = "trivet desk: a request was still running; stopped without waiting for it\n";
        [[maybe_unused]] const auto n = ::write(2, msg, sizeof msg - 1);
        std::cout.flush();
        ::_exit(0);
      }
    }
  });
  const bool ok = svr.listen_after_bind();
  listen_ended = true;
  {
    std::lock_guard<std::mutex> lock(m);
    done = true;
  }
  cv.notify_all();
  pthread_kill(waiter.native_handle(), SIGTERM);  // wakes its sigwait() if no signal came
  waiter.join();
  return ok ? 0 : 3;
}

}  // namespace

bool host_allowed(const std::string& host_header, const std::string& listen_host, int port) {
  if (host_header.empty() || port <= 0) return false;
  const std::string h = lower(host_header);
  const std::string p = ":" + std::to_string(port);
  std::vector<std::string> names = {"127.0.0.1", "localhost", "[::1]", lower(url_host(listen_host))};
  for (const auto& n : names) {
    if (h == n + p) return true;
    if (port == 80 && h == n) return true;
  }
  return false;
}

bool origin_allowed(const std::string& origin, const std::string& listen_host, int port) {
  const std::string scheme = "http://";
  const std::string o = lower(origin);
  if (o.compare(0, scheme.size(), scheme) != 0) return false;
  const std::string host = o.substr(scheme.size());
  // The bare host and port: no path, user or anything else.
  if (host.find_first_of("/@?# ") != std::string::npos) return false;
  return host_allowed(host, listen_host, port);
}

std::string download_name(const std::string& title, const std::string& fallback, const std::string& extension) {
  std::string base = title.empty() ? fallback : title;
  std::string out;
  for (unsigned char c : base) {
    const bool keep = std::isalnum(c) || c == '-' || c == '_' || c == '.' || c == ' ';
    out += keep && c < 0x80 ? static_cast<char>(c) : '-';
  }
  // No leading dots (a hidden file) or spaces; trimmed.
  const auto first = out.find_first_not_of(". -");
  out = first == std::string::npos ? std::string() : out.substr(first);
  while (!out.empty() && (out.back() == ' ' || out.back() == '.')) out.pop_back();
  if (out.size() > 80) out.resize(80);
  if (out.empty()) out = "beam";
  return out + extension;
}

std::string startup_problem(const Options& o) {
  if (o.port < 0 || o.port > 65535) return "--port: give a port from 0 to 65535 (0: any free port)";
  if (o.host.empty()) return "--host: give an address to listen on";
  if (o.file.empty()) return "";
  if (o.file == "-") return "FILE: the desk reads and saves a file; '-' (standard input or output) is not one";
  struct stat st{};
  if (::lstat(o.file.c_str(), &st) != 0) {
    if (errno != ENOENT) return "FILE: " + o.file + ": " + std::strerror(errno);
    return "";  // a new file: the first save makes it
  }
  std::string why;
  const auto text = read_small_file(o.file, o.max_body, &why);
  if (!text) return "FILE: " + o.file + ": " + why;
  if (!is_json_object(without_bom(*text))) {
    const input::BeamFile f = input::parse_beam_text(*text, o.file);
    std::string reason = f.errors.empty() ? "a beam file is a JSON object" : f.errors.front().format(o.file);
    return "FILE: " + o.file + " is not a JSON object, so the desk cannot show it: " + reason + " (fix it in an editor first)";
  }
  return "";
}

int serve(const Options& options, const Backend& backend) {
  Desk desk(options, backend);
  return desk.run();
}

}  // namespace trivet::desk
