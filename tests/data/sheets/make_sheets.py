#!/usr/bin/env python3
"""Writes the spreadsheet fixtures of tests/cli_sheets.sh (run it from this
folder; the files are committed, so the tests need no Python).

The beam (two-span.json, an invented demo): two equal spans L = 5 m,
pinned-roller-roller, a udl w = 12 kN/m over both, EI constant.

Closed form derived here: by symmetry the beam does not rotate over the
middle support B, so each span is a propped cantilever, pinned at its outer
end and fixed at B. For a propped cantilever under a udl the outer reaction
is 3wL/8 (compatibility of the tip deflection: wL^4/8EI = R L^3/3EI), so
R_A = R_C = 3wL/8 = 22.5 kN, R_B = 2wL - 2 R_A = 10wL/8 = 75 kN,
M_B = R_A L - wL^2/2 = -wL^2/8 = -37.5 kN*m, and in span 1
M(x) = R_A x - w x^2 / 2, V(x) = dM/dx = R_A - w x; span 2 by symmetry,
M(x) = M(2L - x), V(x) = -V(2L - x). The shear jumps at B: the export gives
x = 5 twice, left limit first.
"""
import zipfile

L, W = 5.0, 12.0
RA = 3 * W * L / 8


def station(x):
    if x <= L:
        return x, RA * x - W * x * x / 2, RA - W * x
    m, v = RA * (2 * L - x) - W * (2 * L - x) ** 2 / 2, -(RA - W * (2 * L - x))
    return x, m, v


def stations():
    rows = []
    for k in range(0, 21):
        x = 0.5 * k
        if k == 10:
            rows.append(station(x))  # left of B
            rows.append((x, station(x)[1], -station(x)[2]))  # right of B
        else:
            rows.append(station(x))
    return rows


def esc(s):
    return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace('"', "&quot;")


def col(c):
    s = ""
    while c > 0:
        c, r = divmod(c - 1, 26)
        s = chr(65 + r) + s
    return s


def write_xlsx(path, sheets):
    """sheets: [(name, rows)]; a row is a list of str, float or None."""
    shared, index = [], {}
    parts = {}
    for n, (name, rows) in enumerate(sheets, 1):
        xml = ['<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
               '<worksheet xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"><sheetData>']
        for r, row in enumerate(rows, 1):
            if not any(v is not None for v in row):
                continue
            xml.append('<row r="%d">' % r)
            for c, v in enumerate(row, 1):
                if v is None:
                    continue
                ref = "%s%d" % (col(c), r)
                if isinstance(v, str):
                    if v not in index:
                        index[v] = len(shared)
                        shared.append(v)
                    xml.append('<c r="%s" t="s"><v>%d</v></c>' % (ref, index[v]))
                else:
                    xml.append('<c r="%s"><v>%s</v></c>' % (ref, repr(float(v))))
            xml.append("</row>")
        xml.append("</sheetData></worksheet>")
        parts["xl/worksheets/sheet%d.xml" % n] = "".join(xml)
    sst = ['<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
           '<sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" count="%d" uniqueCount="%d">'
           % (len(shared), len(shared))]
    sst += ["<si><t>%s</t></si>" % esc(s) for s in shared]
    sst.append("</sst>")
    parts["xl/sharedStrings.xml"] = "".join(sst)
    parts["xl/workbook.xml"] = (
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
        '<workbook xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" '
        'xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets>'
        + "".join('<sheet name="%s" sheetId="%d" r:id="rId%d"/>' % (esc(name), n, n)
                  for n, (name, _) in enumerate(sheets, 1))
        + "</sheets></workbook>")
    rel = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/"
    parts["xl/_rels/workbook.xml.rels"] = (
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
        '<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">'
        + "".join('<Relationship Id="rId%d" Type="%sworksheet" Target="worksheets/sheet%d.xml"/>' % (n, rel, n)
                  for n in range(1, len(sheets) + 1))
        + '<Relationship Id="rId%d" Type="%ssharedStrings" Target="sharedStrings.xml"/>' % (len(sheets) + 1, rel)
        + "</Relationships>")
    parts["_rels/.rels"] = (
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
        '<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">'
        '<Relationship Id="rId1" Type="%sofficeDocument" Target="xl/workbook.xml"/></Relationships>' % rel)
    parts["[Content_Types].xml"] = (
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
        '<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
        '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>'
        '<Default Extension="xml" ContentType="application/xml"/>'
        '<Override PartName="/xl/workbook.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml"/>'
        + "".join('<Override PartName="/xl/worksheets/sheet%d.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"/>' % n
                  for n in range(1, len(sheets) + 1))
        + '<Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-officedocument.spreadsheetml.sharedStrings+xml"/>'
        "</Types>")
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as z:
        for name in ["[Content_Types].xml", "_rels/.rels", "xl/workbook.xml", "xl/_rels/workbook.xml.rels",
                     "xl/sharedStrings.xml"] + sorted(p for p in parts if p.startswith("xl/worksheets/")):
            z.writestr(zipfile.ZipInfo(name, (2026, 1, 1, 0, 0, 0)), parts[name], zipfile.ZIP_DEFLATED)


def write_ods(path, sheets):
    body = []
    for name, rows in sheets:
        body.append('<table:table table:name="%s">' % esc(name))
        blank = 0
        for row in rows:
            if not any(v is not None for v in row):
                blank += 1
                continue
            if blank:
                body.append('<table:table-row table:number-rows-repeated="%d"><table:table-cell/></table:table-row>' % blank)
                blank = 0
            body.append("<table:table-row>")
            for v in row:
                if v is None:
                    body.append("<table:table-cell/>")
                elif isinstance(v, str):
                    body.append('<table:table-cell office:value-type="string"><text:p>%s</text:p></table:table-cell>' % esc(v))
                else:
                    body.append('<table:table-cell office:value-type="float" office:value="%s"><text:p>%.2f</text:p></table:table-cell>'
                                % (repr(float(v)), v))
            # the trailing empty cells a spreadsheet program writes
            body.append('<table:table-cell table:number-columns-repeated="16380"/></table:table-row>')
        body.append('<table:table-row table:number-rows-repeated="1048000"><table:table-cell table:number-columns-repeated="16384"/></table:table-row>')
        body.append("</table:table>")
    content = ('<?xml version="1.0" encoding="UTF-8"?>\n'
               '<office:document-content xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" '
               'xmlns:table="urn:oasis:names:tc:opendocument:xmlns:table:1.0" '
               'xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0" office:version="1.2">'
               "<office:body><office:spreadsheet>" + "".join(body) + "</office:spreadsheet></office:body></office:document-content>")
    manifest = ('<?xml version="1.0" encoding="UTF-8"?>\n'
                '<manifest:manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0" manifest:version="1.2">'
                '<manifest:file-entry manifest:full-path="/" manifest:media-type="application/vnd.oasis.opendocument.spreadsheet"/>'
                '<manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/></manifest:manifest>')
    with zipfile.ZipFile(path, "w") as z:
        z.writestr(zipfile.ZipInfo("mimetype", (2026, 1, 1, 0, 0, 0)), "application/vnd.oasis.opendocument.spreadsheet",
                   zipfile.ZIP_STORED)
        z.writestr(zipfile.ZipInfo("META-INF/manifest.xml", (2026, 1, 1, 0, 0, 0)), manifest, zipfile.ZIP_DEFLATED)
        z.writestr(zipfile.ZipInfo("content.xml", (2026, 1, 1, 0, 0, 0)), content, zipfile.ZIP_DEFLATED)


def table(moment_factor=1.0):
    rows = [["Demo export: two-span floor beam, stations"], [None], ["x [m]", "moment [kN*m]", "shear [kN]"]]
    rows += [[x, m * moment_factor, v] for x, m, v in stations()]
    return rows


notes = [["Notes"], ["The stations are on the next sheet."]]
write_xlsx("two-span-stations.xlsx", [("Stations", table())])
write_xlsx("two-span-stations-moments-x1000.xlsx", [("Stations", table(1000.0))])
write_ods("two-span-stations.ods", [("Notes", notes), ("Stations", table())])
claims = [["Hand check of the two-span beam"], [None],
          ["quantity", "where", "value", "tolerance"],
          ["reaction", "A", 22.5, None], ["reaction", "node 2", 75.0, None], ["moment", "B", -37.5, None],
          ["moment", "x = 2.5 m", 18.75, "0.5%"]]
write_xlsx("two-span-claims.xlsx", [("Claims", claims)])
