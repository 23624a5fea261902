#!/usr/bin/python3
"""Writes the example workbooks of demo_workbook.py. Run by the build (target elyblock_spreadsheet_examples).

usage: make_examples.py OUT_DIR [--variables N] [--calc-name PREFIX]

  OUT_DIR/elyblock-demo.ods   for LibreOffice Calc with the elyblock add-in: an OpenDocument
                              spreadsheet written here as XML (formulas under the add-in's stored
                              names, PREFIX + function); no cached results, Calc computes on load
  OUT_DIR/elyblock-demo.xlsx  for Excel with the VBA module imported (python3-openpyxl)

N is the number of variables of the demo plant (the size of ELYVARIABLES' array formula); without
--variables the elyblock Python package (on PYTHONPATH) counts them. Without python3-openpyxl the
.xlsx is skipped, saying so.
"""
import argparse
import os
import re
import sys
import zipfile
from xml.sax.saxutils import escape, quoteattr

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from demo_workbook import Call, Formula, Name, Ref, cell_name, workbook  # noqa: E402

DATE = (2024, 1, 1, 0, 0, 0)
ADDRESS = re.compile(r"^(\$?)([A-Z]+)(\$?)(\d+)$")


def split_address(address):
    """"$B$8" -> (0-based column 1, row 8)."""
    m = ADDRESS.match(address)
    letters = m.group(2)
    column = 0
    for ch in letters:
        column = column * 26 + ord(ch) - ord("A") + 1
    return column - 1, int(m.group(4))


# ---- formulas ------------------------------------------------------------------------------------
def text_literal(text):
    return '"' + text.replace('"', '""') + '"'


def number_literal(x):
    return repr(float(x)) if float(x) != int(x) else str(int(x))


def formula_text(call, dialect, prefix=""):
    """A call as formula text: dialect "odf" (OpenFormula: [.A1] references, ';') or "excel"."""
    def argument(a):
        if isinstance(a, Call):
            return formula_text(a, dialect, prefix)
        if isinstance(a, Ref):
            if dialect == "odf":
                return "[" + ":".join("." + part for part in a.address.split(":")) + "]"
            return a.address
        if isinstance(a, Name):
            return a.name
        if isinstance(a, str):
            return text_literal(a)
        return number_literal(a)
    separator = ";" if dialect == "odf" else ","
    return f"{prefix}{call.name}({separator.join(argument(a) for a in call.args)})"


# ---- OpenDocument spreadsheet --------------------------------------------------------------------
NAMESPACES = {
    "office": "urn:oasis:names:tc:opendocument:xmlns:office:1.0",
    "style": "urn:oasis:names:tc:opendocument:xmlns:style:1.0",
    "text": "urn:oasis:names:tc:opendocument:xmlns:text:1.0",
    "table": "urn:oasis:names:tc:opendocument:xmlns:table:1.0",
    "fo": "urn:oasis:names:tc:opendocument:xmlns:xsl-fo-compatible:1.0",
    "of": "urn:oasis:names:tc:opendocument:xmlns:of:1.2",
}
XMLNS = " ".join(f'xmlns:{k}="{v}"' for k, v in NAMESPACES.items())
ODS_MANIFEST = """<?xml version="1.0" encoding="UTF-8"?>
<manifest:manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0" manifest:version="1.3">
 <manifest:file-entry manifest:full-path="/" manifest:version="1.3" manifest:media-type="application/vnd.oasis.opendocument.spreadsheet"/>
 <manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/>
</manifest:manifest>
"""


def ods_cell(value, prefix):
    if value is None:
        return "<table:table-cell/>"
    if isinstance(value, Formula):
        attrs = f' table:formula={quoteattr("of:=" + formula_text(value.call, "odf", prefix))}'
        if value.array:
            attrs += (f' table:number-matrix-rows-spanned="{value.array[0]}"'
                      f' table:number-matrix-columns-spanned="{value.array[1]}"')
        return f"<table:table-cell{attrs}/>"
    if isinstance(value, str):
        return f'<table:table-cell office:value-type="string"><text:p>{escape(value)}</text:p></table:table-cell>'
    return f'<table:table-cell office:value-type="float" office:value="{number_literal(value)}"/>'


def ods_content(sheets, names, prefix):
    out = [f'<?xml version="1.0" encoding="UTF-8"?>\n<office:document-content {XMLNS} office:version="1.3">',
           "<office:automatic-styles>",
           '<style:style style:name="wide" style:family="table-column">'
           '<style:table-column-properties style:column-width="7cm"/></style:style>',
           '<style:style style:name="normal" style:family="table-column">'
           '<style:table-column-properties style:column-width="3.5cm"/></style:style>',
           "</office:automatic-styles>", "<office:body><office:spreadsheet>"]
    for sheet_name, cells in sheets:
        grid = {}
        for address, value in cells.items():
            column, row = split_address(address)
            grid[(row, column)] = value
        rows = max(r for r, _ in grid)
        columns = max(c for _, c in grid) + 1
        out.append(f"<table:table table:name={quoteattr(sheet_name)}>")
        out.append('<table:table-column table:style-name="wide"/>')
        if columns > 1:
            out.append(f'<table:table-column table:style-name="normal" table:number-columns-repeated="{columns - 1}"/>')
        for r in range(1, rows + 1):
            out.append("<table:table-row>" + "".join(ods_cell(grid.get((r, c)), prefix) for c in range(columns))
                       + "</table:table-row>")
        out.append("</table:table>")
    out.append("<table:named-expressions>")
    for name, (sheet, cell_range) in names.items():
        start, end = cell_range.split(":")
        out.append(f'<table:named-range table:name={quoteattr(name)} table:base-cell-address="${sheet}.$A$1" '
                   f'table:cell-range-address="${sheet}.{start}:.{end}"/>')
    out.append("</table:named-expressions>")
    out.append("</office:spreadsheet></office:body></office:document-content>\n")
    return "\n".join(out)


def write_ods(path, sheets, names, prefix):
    with zipfile.ZipFile(path + ".tmp", "w") as z:
        # The media type comes first and uncompressed (ODF 1.3 part 2, 3.3).
        z.writestr(zipfile.ZipInfo("mimetype", DATE), "application/vnd.oasis.opendocument.spreadsheet",
                   compress_type=zipfile.ZIP_STORED)
        for name, data in (("META-INF/manifest.xml", ODS_MANIFEST), ("content.xml", ods_content(sheets, names, prefix))):
            z.writestr(zipfile.ZipInfo(name, DATE), data, compress_type=zipfile.ZIP_DEFLATED)
    os.replace(path + ".tmp", path)


# ---- Excel workbook ------------------------------------------------------------------------------
def write_xlsx(path, sheets, names):
    import openpyxl
    from openpyxl.workbook.defined_name import DefinedName

    book = openpyxl.Workbook()
    book.remove(book.active)
    for sheet_name, cells in sheets:
        sheet = book.create_sheet(sheet_name)
        sheet.column_dimensions["A"].width = 40
        for address, value in cells.items():
            if isinstance(value, Formula):
                sheet[address] = "=" + formula_text(value.call, "excel")
                if value.array:
                    column, row = split_address(address)
                    last = cell_name(column + value.array[1] - 1, row + value.array[0] - 1)
                    sheet.formula_attributes[address] = {"t": "array", "ref": f"{address}:{last}"}
            else:
                sheet[address] = value
    for name, (sheet, cell_range) in names.items():
        book.defined_names.append(DefinedName(name, attr_text=f"{sheet}!{cell_range}"))
    book.save(path + ".tmp")
    os.replace(path + ".tmp", path)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("out_dir")
    ap.add_argument("--variables", type=int)
    ap.add_argument("--calc-name", default="ORG.ELYBLOCK.CALC.FUNCTIONS.",
                    help="the prefix under which Calc documents store the add-in's functions")
    a = ap.parse_args()
    os.makedirs(a.out_dir, exist_ok=True)
    count = a.variables
    if count is None:
        import elyblock
        from demo_workbook import DEMO_PLANT
        with elyblock.Block(DEMO_PLANT) as block:
            count = len(block.variables())
    sheets, names = workbook(count)
    write_ods(os.path.join(a.out_dir, "elyblock-demo.ods"), sheets, names, a.calc_name)
    try:
        import openpyxl  # noqa: F401
    except ImportError:
        print("elyblock-demo.xlsx skipped: python3-openpyxl is not installed (scripts/install-deps installs it)")
        return 0
    write_xlsx(os.path.join(a.out_dir, "elyblock-demo.xlsx"), sheets, names)
    return 0


if __name__ == "__main__":
    sys.exit(main())
