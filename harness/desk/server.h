// trivet desk: a local web server for checking one beam in a browser.
//
// The server knows HTTP, the page and the reports; it does not know how a
// beam is checked: the command line hands it the check of `trivet check`
// (Backend::check), so the page's results are that command's, never a copy.
// The interface with the page is docs/desk-api.md.
#pragma once

#include <functional>
#include <string>

#include "reports/html_report.h"
#include "reports/report.h"
#include "reports/reports.h"

namespace trivet::desk {

// What the command line gives the server.
struct Backend {
  // Reads `text` as a beam file shown under the name `name` and checks it as
  // `trivet check` checks a file. May throw (an internal failure: 500).
  std::function<reports::Report(const std::string& text, const std::string& name)> check;
  reports::RunInfo run;             // the JSON report's tool, methods, agreement
  reports::HtmlOptions html;        // the HTML report's options (also the plots' size and thinning)
  reports::ConsoleOptions console;  // the console text (no colour)
  std::string starter;              // the beam of `trivet example`, for a desk without FILE
};

struct Options {
  std::string file;                 // FILE: read at the start, the only path ever written; may be empty
  std::string host = "127.0.0.1";   // the address to listen on
  int port = 8320;                  // 0: any free port
  bool open = false;                // run xdg-open on the address
  std::size_t max_body = 16u << 20; // larger request bodies get 413
};

// Checks FILE (readable JSON text, an object, within max_body; or a path
// that does not exist yet, which the first save creates) and the options.
// "" or the reason the desk cannot start (exit 2).
std::string startup_problem(const Options& options);

// Listens, prints "trivet desk: http://HOST:PORT/" as the first line of
// standard output (flushed) and serves until SIGINT or SIGTERM. Returns the
// exit code: 0 after a clean stop, 2 when it cannot listen, 3 on an internal
// failure. Blocks SIGINT and SIGTERM in the calling thread (and so in every
// thread it starts) and takes them with sigwait().
int serve(const Options& options, const Backend& backend);

// The Host header values the desk answers to (DNS rebinding): the loopback
// names with the port, and the listening address with the port.
bool host_allowed(const std::string& host_header, const std::string& listen_host, int port);

// The Origin header values whose POSTs the desk takes: "http://" and a
// Host it answers to (host_allowed), nothing more. A page of another site
// ("http://attacker.example", "null") is refused.
bool origin_allowed(const std::string& origin, const std::string& listen_host, int port);

// A file name for a download: the beam's title (or `fallback`) with
// anything but letters, digits, '-', '_', '.' and spaces made '-', at most
// 80 bytes, and `extension` added.
std::string download_name(const std::string& title, const std::string& fallback, const std::string& extension);

}  // namespace trivet::desk
