#!/usr/bin/env python3
"""trivet desk's server end to end (docs/desk-api.md), with the standard library only.

usage: desk_server_test.py TRIVET EXAMPLE_BEAM_FILE

Starts `TRIVET desk beam.json --port 0` on a copy of the example in a
temporary directory, reads the address from the first line of its standard
output and checks every endpoint: the page, /api/start, /api/check against
`TRIVET check --json` on the same file, /api/view, /api/report.html,
/api/save; bad input (an invalid beam, text that is not JSON, a body over
16 MiB, a foreign Host, a chunked body, an unknown page); that a small
request is answered while a large check runs; and that the server still
answers after all that and stops with exit 0 on SIGINT. A second desk
without FILE: /api/start gives `trivet example`'s beam and /api/save is 409.
Every check prints what it saw when it fails; the test exits 1 then.
"""
import http.client
import json
import os
import re
import select
import shutil
import signal
import subprocess
import sys
import tempfile
import threading
import time

FAILED = []


def check(cond, what, detail=""):
    if cond:
        print("ok:", what)
    else:
        FAILED.append(what)
        print("FAIL:", what, ("\n  " + str(detail)[:2000]) if detail != "" else "")
    return cond


class Desk:
    """One `trivet desk` process and requests to it."""

    def __init__(self, trivet, args, cwd, env=None):
        self.err_path = os.path.join(cwd, "desk-%d.err" % len(os.listdir(cwd)))
        self.err = open(self.err_path, "wb")
        self.proc = subprocess.Popen([trivet, "desk"] + args + ["--port", "0"], cwd=cwd,
                                     stdout=subprocess.PIPE, stderr=self.err, env=env)
        line = b""
        deadline = time.time() + 30
        while not line.endswith(b"\n") and time.time() < deadline:
            ready, _, _ = select.select([self.proc.stdout], [], [], 0.5)
            if ready:
                ch = os.read(self.proc.stdout.fileno(), 1)
                if not ch:
                    break
                line += ch
        self.first_line = line.decode("utf-8", "replace")
        m = re.fullmatch(r"trivet desk: http://127\.0\.0\.1:(\d+)/\n", self.first_line)
        if not m:
            self.stop()
            raise SystemExit("FAIL: first line of standard output is not the address: %r\n%s" %
                             (self.first_line, self.stderr()))
        self.port = int(m.group(1))

    def stderr(self):
        self.err.flush()
        with open(self.err_path, "rb") as f:
            return f.read().decode("utf-8", "replace")

    def request(self, method, path, body=None, host=None, headers=None, timeout=120):
        conn = http.client.HTTPConnection("127.0.0.1", self.port, timeout=timeout)
        try:
            conn.putrequest(method, path, skip_host=True, skip_accept_encoding=True)
            conn.putheader("Host", host if host is not None else "127.0.0.1:%d" % self.port)
            for k, v in (headers or {}).items():
                conn.putheader(k, v)
            if body is not None and not (headers and "Transfer-Encoding" in headers):
                conn.putheader("Content-Length", str(len(body)))
            conn.endheaders(body)
            r = conn.getresponse()
            return r.status, {k.lower(): v for k, v in r.getheaders()}, r.read()
        finally:
            conn.close()

    def stop(self, sig=signal.SIGINT, wait=15):
        if self.proc.poll() is None:
            self.proc.send_signal(sig)
        try:
            return self.proc.wait(wait)
        except subprocess.TimeoutExpired:
            self.proc.kill()
            self.proc.wait()
            return None


def load(b):
    return json.loads(b.decode("utf-8"))


def trivet_check_json(trivet, cwd, name):
    out = os.path.join(cwd, "cli-report.json")
    p = subprocess.run([trivet, "check", name, "--json", out], cwd=cwd, capture_output=True)
    with open(out, "rb") as f:
        text = f.read()
    os.remove(out)
    return p.returncode, text


def normalized(report, name):
    """The report with the beam's file name (and the messages that start with it) as `name`."""
    r = json.loads(json.dumps(report))
    for b in r["beams"]:
        old = b["file"]
        b["file"] = name
        for e in b.get("errors", []):
            if e.get("message", "").startswith(old + ": "):
                e["message"] = name + e["message"][len(old):]
    return r


def big_beam(spans):
    return json.dumps({
        "title": "many spans (test)", "units": {"force": "kN", "length": "m"},
        "spans": [{"length": 4.0 + (i % 3), "EI": 50000} for i in range(spans)],
        "supports": ["pinned"] + ["roller"] * spans,
        "loads": [{"type": "udl", "span": i + 1, "w": 8.0 + (i % 5)} for i in range(spans)],
    }).encode()


def main():
    if len(sys.argv) != 3:
        print(__doc__)
        return 2
    trivet, example = os.path.abspath(sys.argv[1]), os.path.abspath(sys.argv[2])
    work = tempfile.mkdtemp(prefix="trivet-desk-test-")
    try:
        run(trivet, example, work)
    finally:
        shutil.rmtree(work, ignore_errors=True)
    if FAILED:
        print("\n%d checks failed:" % len(FAILED))
        for f in FAILED:
            print("  -", f)
        return 1
    print("\nall checks passed")
    return 0


def run(trivet, example, work):
    beam_path = os.path.join(work, "beam.json")
    shutil.copyfile(example, beam_path)
    with open(beam_path, "rb") as f:
        original = f.read()
    desk = Desk(trivet, ["beam.json"], work)
    try:
        body_checks(desk, trivet, work, beam_path, original)
    finally:
        rc = desk.stop()
        check(rc == 0, "SIGINT stops the desk with exit 0", "exit %r; stderr:\n%s" % (rc, desk.stderr()))

    # Without FILE: the starter beam, and nothing to save to. With --open,
    # xdg-open (here a stand-in that notes its argument) gets the address.
    bin_dir = os.path.join(work, "bin")
    os.mkdir(bin_dir)
    opened = os.path.join(work, "opened.txt")
    with open(os.path.join(bin_dir, "xdg-open"), "w") as f:
        f.write("#!/bin/sh\nprintf '%%s' \"$1\" > '%s'\n" % opened)
    os.chmod(os.path.join(bin_dir, "xdg-open"), 0o755)
    env = dict(os.environ, PATH=bin_dir + os.pathsep + os.environ.get("PATH", ""))
    bare = Desk(trivet, ["--open"], work, env)
    deadline = time.time() + 10
    while not os.path.exists(opened) and time.time() < deadline:
        time.sleep(0.05)
    time.sleep(0.1)
    seen = open(opened).read() if os.path.exists(opened) else None
    check(seen == "http://127.0.0.1:%d/" % bare.port, "--open runs xdg-open on the address", seen)
    try:
        st, _, b = bare.request("GET", "/api/start")
        starter = subprocess.run([trivet, "example"], capture_output=True).stdout
        ok = st == 200
        if ok:
            d = load(b)
            ok = d["file"] is None and d["writable"] is False and d["beam"] == json.loads(starter) and "text" not in d
        check(ok, "without FILE, /api/start gives file null, not writable, and the beam of `trivet example`", b[:500])
        st, _, b = bare.request("POST", "/api/save", starter)
        check(st == 409, "without FILE, /api/save is 409", (st, b[:300]))
    finally:
        rc = bare.stop(signal.SIGTERM)
        check(rc == 0, "SIGTERM stops the desk with exit 0", "exit %r; stderr:\n%s" % (rc, bare.stderr()))


def body_checks(desk, trivet, work, beam_path, original):
    port = desk.port

    # The page: one document, its CSS and script inline, no network reference.
    st, h, page = desk.request("GET", "/")
    text = page.decode("utf-8", "replace")
    check(st == 200 and h.get("content-type", "").startswith("text/html"), "GET / is an HTML page", (st, h))
    check("<script" in text and "<style" in text, "the page has its script and style sheet inline")
    check(not re.search(r"<script[^>]*\ssrc\s*=", text, re.I) and not re.search(r"<link[^>]*\shref\s*=", text, re.I),
          "the page loads no script or style sheet from elsewhere")
    check("missing at build time" not in text, "every file the page names was built into it",
          re.findall(r"<!-- trivet desk: .* -->", text))
    # Namespace names in the script (createElementNS) are names, never fetched.
    namespaces = {"http://www.w3.org/2000/svg", "http://www.w3.org/1999/xhtml", "http://www.w3.org/1999/xlink",
                  "http://www.w3.org/XML/1998/namespace", "http://www.w3.org/2000/xmlns/"}
    urls = [u for u in re.findall(r"https?://[^\s\"'<>)]*", text) if u not in namespaces]
    check(not urls, "the page has no http:// or https:// reference", urls[:10])
    csp = h.get("content-security-policy", "")
    check("default-src 'none'" in csp and "connect-src 'self'" in csp,
          "the page is served with a policy that allows no other host", csp)
    check("access-control-allow-origin" not in h, "no Access-Control-Allow-Origin header", h)

    # /api/start: the file as it is.
    st, _, b = desk.request("GET", "/api/start")
    d = load(b) if st == 200 else {}
    check(st == 200 and d.get("file") == "beam.json" and d.get("writable") is True and
          d.get("beam") == json.loads(original), "/api/start gives the file's name and beam", b[:500])
    check(d.get("text", "").encode() == original, "/api/start gives FILE's bytes as \"text\"")
    check(d.get("forces") == ["N", "kN", "MN", "lbf", "kip"] and d.get("lengths") == ["mm", "cm", "m", "in", "ft"],
          "/api/start lists the beam file's force and length units", (d.get("forces"), d.get("lengths")))

    # /api/check is `trivet check --json`, byte for byte, for the same file.
    st, h, b = desk.request("POST", "/api/check", original)
    rc, cli = trivet_check_json(trivet, work, "beam.json")
    check(st == 200 and h.get("content-type", "").startswith("application/json"), "/api/check answers 200 with JSON",
          (st, b[:300]))
    check(b == cli, "/api/check gives the very bytes of `trivet check beam.json --json`",
          "desk %d bytes, check %d bytes (exit %d)" % (len(b), len(cli), rc))
    report = load(b)
    caution = report.get("caution", "")
    check(len(caution) > 50 and caution in text, "the page carries the reports' caution", caution)

    # An edited beam: the same report as `trivet check` of a file holding it;
    # the name says the beam is not the saved file (the only difference).
    edited = original.replace(b"96000", b"97000", 1)
    check(edited != original, "the example has an EI to edit")
    with open(os.path.join(work, "edited.json"), "wb") as f:
        f.write(edited)
    st, _, b = desk.request("POST", "/api/check", edited)
    rc, cli = trivet_check_json(trivet, work, "edited.json")
    mine = load(b)
    check(st == 200 and mine["beams"][0]["file"] == "beam.json (edited, not saved)",
          "an edited beam is checked under the name 'beam.json (edited, not saved)'", b[:400])
    check(normalized(mine, "x") == normalized(json.loads(cli), "x"),
          "an edited beam's report equals `trivet check` of a file holding it, but for the file name")

    # /api/view: that report, the plots of the HTML report, the console text.
    st, _, b = desk.request("POST", "/api/view", original)
    v = load(b) if st == 200 else {}
    check(st == 200 and v.get("report") == report, "/api/view carries the /api/check report", b[:300])
    sets = [s for s in report["beams"][0]["results"]]
    plots = v.get("plots", [])
    check([p.get("load_set") for p in plots] == sets and all(p.get("svg", "").startswith("<svg") for p in plots),
          "/api/view has one SVG plot per load set", [(p.get("load_set"), p.get("svg", "")[:40], p.get("error")) for p in plots])
    check(all("http://" not in p.get("svg", "") for p in plots), "the plots have no namespace or network URL")
    check(caution in v.get("console", "") and "agree" in v.get("console", ""),
          "/api/view has the console report with the caution", v.get("console", "")[:300])
    # The display units: the file's kN and m are read as kN, kN*m, m and mm.
    disp = v.get("display", {})
    check(disp.get("deflection") == {"label": "mm", "factor": 1000.0} and disp.get("force") == {"label": "kN", "factor": 1.0}
          and disp.get("moment", {}).get("label") == "kN*m", "/api/view gives the display units", disp)
    # A file in N and mm: forces shown in kN (x 0.001), moments in kN*m (x 1e-6), lengths in m (x 0.001).
    nmm = json.loads(original)
    nmm["units"] = {"force": "N", "length": "mm"}
    st, _, b = desk.request("POST", "/api/view", json.dumps(nmm).encode())
    disp = load(b).get("display", {}) if st in (200, 400) else {}
    ok_units = (disp.get("force", {}).get("label") == "kN" and abs(disp["force"]["factor"] - 1e-3) < 1e-15
                and disp.get("moment", {}).get("label") == "kN*m" and abs(disp["moment"]["factor"] - 1e-6) < 1e-18
                and disp.get("length", {}).get("label") == "m" and abs(disp["length"]["factor"] - 1e-3) < 1e-15
                and disp.get("deflection", {}).get("label") == "mm" and abs(disp["deflection"]["factor"] - 1.0) < 1e-15)
    check(st == 200 and ok_units, "/api/view of an N and mm beam gives kN, kN*m, m and mm", (st, disp))

    # /api/report.html: the HTML report as a download.
    st, h, b = desk.request("POST", "/api/report.html", original)
    html = b.decode("utf-8", "replace")
    check(st == 200 and h.get("content-type", "").startswith("text/html") and
          re.fullmatch(r'attachment; filename="[^"/\\]+\.html"', h.get("content-disposition", "")) is not None,
          "/api/report.html is an HTML download", (st, h))
    check('id="caution"' in html and "<svg" in html and "<script" not in html.lower(),
          "the HTML report has its caution and plots and no script")

    # Bad input: located errors, 400; the server goes on.
    bad = json.loads(original)
    bad["spans"][1]["length"] = -2.5
    st, _, b = desk.request("POST", "/api/check", json.dumps(bad).encode())
    errs = load(b)["beams"][0]["errors"] if st == 400 else []
    check(st == 400 and any(e["pointer"] == "/spans/1/length" and e["where"] == "span 2" for e in errs),
          "an invalid beam is 400 with the pointer /spans/1/length (span 2)", b[:800])
    st, _, b = desk.request("POST", "/api/view", json.dumps(bad).encode())
    check(st == 400 and load(b)["plots"] == [] and load(b)["report"]["beams"][0]["status"] == "invalid",
          "/api/view of an invalid beam is 400 with no plots", b[:300])
    st, _, b = desk.request("POST", "/api/check", b'{"spans": [1, 2,')
    errs = load(b)["beams"][0]["errors"] if st == 400 else []
    check(st == 400 and errs and errs[0]["id"] == "input.syntax" and "line 1" in errs[0]["reason"],
          "text that is not JSON is 400 with the reader's syntax error", b[:500])
    st, _, b = desk.request("POST", "/api/check", b"\xff\xfe not text")
    check(st == 400, "bytes that are not UTF-8 text are 400", (st, b[:300]))
    st, _, b = desk.request("POST", "/api/check", b" " * (17 << 20))
    check(st == 413, "a body of 17 MiB is 413", (st, b[:200]))
    st, _, b = desk.request("POST", "/api/check", b"[" * 100000)
    check(st == 400, "deeply nested JSON is 400", (st, b[:300]))
    st, _, b = desk.request("POST", "/api/check", original, headers={"Transfer-Encoding": "chunked"})
    check(st == 411, "a chunked body is refused (its size cannot be known before it is read)", (st, b[:200]))
    st, _, b = desk.request("POST", "/api/check", b"")
    errs = load(b)["beams"][0]["errors"] if st == 400 else []
    check(st == 400 and errs and errs[0]["id"] == "input.syntax", "an empty body is 400 with the reader's error", (st, b[:300]))
    st, _, b = desk.request("GET", "/api/start", host="evil.example:%d" % port)
    check(st == 403, "a foreign Host is 403", (st, b[:200]))
    st, _, b = desk.request("GET", "/api/start", host="127.0.0.1:%d" % (port + 1 if port < 65535 else port - 1))
    check(st == 403, "a loopback Host with another port is 403", (st, b[:200]))
    st, _, b = desk.request("POST", "/api/save", edited, host="evil.example:%d" % port)
    check(st == 403, "a save from a foreign Host is 403", (st, b[:200]))
    st, _, b = desk.request("GET", "/api/start", host="localhost:%d" % port)
    check(st == 200, "Host localhost:PORT is answered", (st, b[:200]))
    # Another site's page may send a POST to this address (CSRF): its Origin is refused.
    st, _, b = desk.request("POST", "/api/save", edited, headers={"Origin": "http://attacker.example"})
    check(st == 403, "a save from another site's page (Origin) is 403", (st, b[:200]))
    st, _, b = desk.request("POST", "/api/check", original, headers={"Origin": "null"})
    check(st == 403, "a check from an opaque origin ('null') is 403", (st, b[:200]))
    st, _, b = desk.request("POST", "/api/save", edited, headers={"Sec-Fetch-Site": "cross-site"})
    check(st == 403, "a save marked Sec-Fetch-Site: cross-site is 403", (st, b[:200]))
    st, _, b = desk.request("POST", "/api/check", original,
                            headers={"Origin": "http://127.0.0.1:%d" % port, "Sec-Fetch-Site": "same-origin"})
    check(st == 200, "a check from the desk's own page (Origin) is answered", (st, b[:200]))
    st, _, _ = desk.request("GET", "/etc/passwd")
    check(st == 404, "an unknown page is 404")
    with open(beam_path, "rb") as f:
        check(f.read() == original, "no bad request changed FILE")

    # A large check holds one worker; a small request is answered before it ends.
    big = big_beam(20000)
    times = {}

    conn = http.client.HTTPConnection("127.0.0.1", port, timeout=300)
    conn.putrequest("POST", "/api/check", skip_host=True, skip_accept_encoding=True)
    conn.putheader("Host", "127.0.0.1:%d" % port)
    conn.putheader("Content-Length", str(len(big)))
    conn.endheaders(big)  # returns once the whole body is sent

    def big_answer():
        r = conn.getresponse()
        times["big_head"] = time.monotonic()
        times["big_status"] = r.status
        times["big_bytes"] = len(r.read())
        conn.close()

    t = threading.Thread(target=big_answer)
    t.start()
    st, _, _ = desk.request("GET", "/api/start")
    times["small"] = time.monotonic()
    st2, _, b2 = desk.request("POST", "/api/check", original)
    times["small_check"] = time.monotonic()
    t.join(300)
    check(st == 200 and st2 == 200 and times.get("big_status") == 200,
          "the large check and the small requests all answer 200", times)
    print("  times:", {k: (round(v - times["small"], 3) if isinstance(v, float) else v) for k, v in times.items()})
    check("big_head" in times and times["small_check"] < times["big_head"],
          "a small check is answered while a large check runs (before the large one's answer)", times)

    # Checks in flight are limited (3); past that a check is refused at once
    # (503) and everything else is still answered.
    conns = []
    for _ in range(5):
        c = http.client.HTTPConnection("127.0.0.1", port, timeout=300)
        c.putrequest("POST", "/api/check", skip_host=True, skip_accept_encoding=True)
        c.putheader("Host", "127.0.0.1:%d" % port)
        c.putheader("Content-Length", str(len(big)))
        c.endheaders(big)
        conns.append(c)
    st_start, _, _ = desk.request("GET", "/api/start")
    statuses = []
    for c in conns:
        r = c.getresponse()
        statuses.append(r.status)
        r.read()
        c.close()
    check(sorted(statuses) == [200, 200, 200, 503, 503] and st_start == 200,
          "five large checks at once: three run, two get 503 at once; /api/start is answered meanwhile",
          (statuses, st_start))

    # A beam too long to draw in the desk: its report, and a reason for each missing plot.
    st, _, b = desk.request("POST", "/api/view", big)
    v = load(b) if st == 200 else {}
    plots = v.get("plots", [])
    check(st == 200 and v["report"]["beams"][0]["status"] == "agree" and len(plots) == 1 and plots[0]["svg"] == "" and
          "not drawn in the desk" in plots[0].get("error", ""),
          "/api/view of a 20,000-span beam gives its report and says why it is not drawn",
          (st, [(p.get("load_set"), p.get("error")) for p in plots]))
    st, _, b = desk.request("POST", "/api/report.html", big)
    check(st == 200 and b"No diagrams in this report: not drawn in the desk" in b,
          "the HTML report of a 20,000-span beam says why it has no diagrams", (st, b[:200]))

    # A form's content type (curl's default) and an offer to compress change nothing.
    st, h, b = desk.request("POST", "/api/check", original + b" " * 20000,
                            headers={"Content-Type": "application/x-www-form-urlencoded",
                                     "Accept-Encoding": "gzip, deflate, br"})
    check(st == 200 and "content-encoding" not in h and load(b)["beams"][0]["status"] == "agree",
          "a body sent as a form, with compression offered, is checked and answered uncompressed", (st, h, b[:200]))

    # A second desk on the same port cannot listen (no shared port).
    p = subprocess.run([trivet, "desk", "--port", str(port)], cwd=work, capture_output=True, timeout=30)
    check(p.returncode == 2 and b"cannot listen" in p.stderr,
          "a second desk on the same port exits 2", (p.returncode, p.stdout[:200], p.stderr[:300]))

    # Save: the body, whole, to FILE only; `trivet check` accepts it.
    st, _, b = desk.request("POST", "/api/save", b"{not json")
    check(st == 400, "saving text that is not JSON is 400", (st, b[:200]))
    with open(beam_path, "rb") as f:
        check(f.read() == original, "a refused save leaves FILE as it was")
    st, _, b = desk.request("POST", "/api/save", edited)
    check(st == 200 and load(b) == {"saved": "beam.json"}, "/api/save answers {\"saved\": \"beam.json\"}", (st, b[:200]))
    with open(beam_path, "rb") as f:
        check(f.read() == edited, "/api/save wrote the body to FILE, byte for byte")
    leftovers = [n for n in os.listdir(work) if "trivet-tmp" in n]
    check(not leftovers, "no temporary file is left beside FILE", leftovers)
    p = subprocess.run([trivet, "check", "beam.json"], cwd=work, capture_output=True)
    check(p.returncode == 0, "`trivet check` accepts the saved file", p.stdout[-500:] + p.stderr[-500:])
    st, _, b = desk.request("POST", "/api/check", edited)
    check(st == 200 and load(b)["beams"][0]["file"] == "beam.json",
          "once saved, the beam is checked under FILE's own name", b[:300])

    # After all that the server still answers.
    st, _, b = desk.request("GET", "/api/start")
    check(st == 200 and load(b)["beam"] == json.loads(edited), "the desk still answers, with the saved beam", b[:300])
    check(desk.proc.poll() is None, "the desk is still running", desk.stderr())


if __name__ == "__main__":
    sys.exit(main())
