#!/usr/bin/python3
"""Writes what the spreadsheet hosts take from the function table (functions.json).

    generate.py idl OUT.idl           the UNO interface of the Calc add-in (one method per function)
    generate.py vba BAS [--check]     the generated part of the Excel VBA module: the worksheet
                                      functions' declarations, their argument counts and the
                                      Function Wizard texts (between the module's markers);
                                      --check fails when the committed module is not current

The build runs both (the VBA module is a committed source, updated by the target
elyblock_vba_module; the test spreadsheet.vba_current runs --check).
"""
import json
import os
import sys

HERE = os.path.dirname(os.path.abspath(__file__))
TABLE = os.path.join(HERE, "functions.json")
REPEATED = ("pairs", "rest")
BEGIN = "' ---- BEGIN GENERATED from adapters/spreadsheet/functions.json by generate.py (do not edit) ----"
END = "' ---- END GENERATED ----"


def load(path=TABLE):
    with open(path, encoding="utf-8") as f:
        return json.load(f)


# ---- UNO IDL ---------------------------------------------------------------------------------------
IDL_RESULT = {"number": "double", "text": "string", "array": "sequence< sequence< any > >"}
IDL_MODULE = ("org", "elyblock", "calc")
IDL_INTERFACE = "XFunctions"


def idl(table):
    lines = ["// Written by adapters/spreadsheet/generate.py from functions.json: the worksheet functions of",
             "// the elyblock Calc add-in. The first argument of each is the calling document (Calc passes",
             "// it; it is not shown): a relative plant path is taken from the document's folder.",
             "#include <com/sun/star/beans/XPropertySet.idl>", ""]
    lines += [" ".join(f"module {m} {{" for m in IDL_MODULE), "",
              f"interface {IDL_INTERFACE} : com::sun::star::uno::XInterface", "{"]
    for f in table["functions"]:
        params = ["[in] com::sun::star::beans::XPropertySet document"]
        for a in f["arguments"]:
            kind = "sequence< any >" if a["kind"] in REPEATED else "any"
            params.append(f"[in] {kind} {a['name'].replace('_', '')}")  # UNO IDL names take no '_'; Calc shows the table's
        lines.append(f"    // {f['summary']}")
        lines.append(f"    {IDL_RESULT[f['result']]} {f['name']}({', '.join(params)});")
    lines += ["};", "", " ".join("};" for _ in IDL_MODULE), ""]
    return "\n".join(lines)


# ---- VBA -------------------------------------------------------------------------------------------
def vba_string(text):
    return '"' + text.replace('"', '""') + '"'


def vba_long_string(text, indent):
    """A VBA string expression, split into pieces joined with & so that lines stay short."""
    pieces, rest = [], text
    while len(rest) > 80:
        cut = rest.rfind(" ", 0, 80) + 1 or 80
        pieces.append(rest[:cut])
        rest = rest[cut:]
    pieces.append(rest)
    return (" & _\n" + " " * indent).join(vba_string(p) for p in pieces)


def vba(table):
    for f in table["functions"]:
        for text in [f["summary"]] + [a["description"] for a in f["arguments"]]:
            if len(text) > 255 or not text.isascii():  # Application.MacroOptions takes 255 characters;
                raise SystemExit(f"{f['name']}: a text of functions.json is longer than 255 characters "
                                 f"or not ASCII (the VBA editor imports in the ANSI code page): {text}")
        kinds = [a["kind"] for a in f["arguments"]]
        if any(a.get("optional") for a in f["arguments"]) and any(k in REPEATED for k in kinds):
            raise SystemExit(f"{f['name']}: an optional argument and a repeated one; VBA cannot declare both "
                             f"(Optional cannot be used with ParamArray): make the optional one required "
                             f"(an empty cell can stand for its absence)")
    out = [BEGIN]
    for f in table["functions"]:
        params, fixed, repeated = [], [], None
        for a in f["arguments"]:
            if a["kind"] in REPEATED:
                params.append(f"ParamArray {a['name']}() As Variant")
                repeated = a["name"]
            elif a.get("optional"):
                params.append(f"Optional {a['name']} As Variant")
                fixed.append(a["name"])
            else:
                params.append(f"{a['name']} As Variant")
                fixed.append(a["name"])
        out.append("")
        out.append(f"' {f['summary']}")
        out.append(f"Public Function {f['name']}({', '.join(params)}) As Variant")
        fixed_array = f"Array({', '.join(fixed)})" if fixed else "Array()"
        for a in f["arguments"]:
            if a.get("optional") and a["kind"] not in REPEATED:  # an omitted one counts as an empty cell
                out.append(f"    If IsMissing({a['name']}) Then {a['name']} = Empty")
        if repeated:  # a ParamArray is passed on as a copy in a Variant
            out.append("    Dim rest As Variant")
            out.append(f"    rest = {repeated}")
        rest = "rest" if repeated else "Array()"
        out.append(f"    {f['name']} = ElyCall({vba_string(f['name'])}, {fixed_array}, {rest})")
        out.append("End Function")
    # The fixed-argument counts ELYMESSAGE needs to pass a call on, and the wizard's texts.
    names = ", ".join(f["name"] for f in table["functions"])
    out += ["", "' The functions, for messages.", "Private Function ElyFunctionList() As String",
            f"    ElyFunctionList = {vba_string(names)}", "End Function"]
    out += ["", "' How many arguments each function takes before its repeated one and how many of them it",
            "' requires (fixed = -1: no such function).",
            "Private Sub ElyArity(ByVal name As String, ByRef fixed As Long, ByRef required As Long, ByRef repeated As Boolean)",
            "    Select Case name"]
    for f in table["functions"]:
        fixed = [a for a in f["arguments"] if a["kind"] not in REPEATED]
        required = [a for a in fixed if not a.get("optional")]
        repeated = len(fixed) < len(f["arguments"])
        out.append(f"    Case {vba_string(f['name'])}: fixed = {len(fixed)}: required = {len(required)}: "
                   f"repeated = {'True' if repeated else 'False'}")
    out += ["    Case Else: fixed = -1", "    End Select", "End Sub", "",
            "' Registers the functions' descriptions for Excel's Insert Function dialog (Excel 2010 and later).",
            "' Run once after importing the module (Alt+F8, ElyblockRegister), e.g. from Workbook_Open.",
            "Public Sub ElyblockRegister()"]
    for f in table["functions"]:
        args = [a["description"] for a in f["arguments"]]
        out.append(f"    Application.MacroOptions Macro:={vba_string(f['name'])}, Category:=\"elyblock\", _")
        out.append(f"        Description:={vba_long_string(f['summary'], 12)}" + (", _" if args else ""))
        if args:
            out.append("        ArgumentDescriptions:=Array( _")
            for k, d in enumerate(args):
                out.append("            " + vba_long_string(d, 12) + (", _" if k + 1 < len(args) else ")"))
    out += ["End Sub", END]
    return "\n".join(out)


def replace_generated(text, generated):
    start, end = text.find(BEGIN), text.find(END)
    if start < 0 or end < start:
        raise SystemExit("the VBA module lacks the generated section's markers")
    return text[:start] + generated + text[end + len(END):]


def main(argv):
    if len(argv) >= 3 and argv[1] == "idl":
        with open(argv[2], "w", encoding="utf-8") as f:
            f.write(idl(load()))
        return 0
    if len(argv) >= 3 and argv[1] == "vba":
        path = argv[2]
        with open(path, encoding="utf-8", newline="") as f:
            text = f.read()
        crlf = "\r\n" in text
        current = text.replace("\r\n", "\n")
        wanted = replace_generated(current, vba(load()))
        if "--check" in argv[3:]:
            if wanted != current:
                print(f"{path} is not current with functions.json: run `cmake --build build --target "
                      f"elyblock_vba_module` and commit it", file=sys.stderr)
                return 1
            print(f"{path}: generated part current")
            return 0
        if wanted != current:
            with open(path, "w", encoding="utf-8", newline="") as f:
                f.write(wanted.replace("\n", "\r\n") if crlf else wanted)
            print(f"updated {path}")
        return 0
    print(__doc__, file=sys.stderr)
    return 2


if __name__ == "__main__":
    sys.exit(main(sys.argv))
