"""The elyblock add-in for LibreOffice Calc: a Python UNO component.

It implements the interface generated from functions.json (org.elyblock.calc.XFunctions: one
method per worksheet function, made here from the same table) and com.sun.star.sheet.XAddIn, which gives the Function Wizard
its names and descriptions from the same table. The work is done by elyblock_sheet (in the
extension's pythonpath, with the elyblock package and the native library), which is imported
here but loads the library only on the first call: installing the extension never runs it.

Errors: a call whose arguments or plant are wrong raises a RuntimeException, which Calc shows
as #VALUE!; a call the model refuses (out of range, infeasible, no convergence) returns NaN,
which Calc shows as #NUM!. ELYMESSAGE with the same arguments gives the library's message.
"""
import math
import os

import uno
import unohelper
from com.sun.star.lang import Locale, XLocalizable, XServiceInfo, XServiceName
from com.sun.star.sheet import XAddIn
from com.sun.star.uno import RuntimeException

from org.elyblock.calc import XFunctions

import elyblock_sheet

# Documents store the functions under this name ("ORG.ELYBLOCK.CALC.FUNCTIONS.ELYSOLVE"): it never changes.
IMPLEMENTATION = elyblock_sheet.load_table()["calc_implementation"]
SERVICES = ("com.sun.star.sheet.AddIn", IMPLEMENTATION)
CATEGORY = "Add-In"  # Calc's category for add-in functions (its programmatic name)


def _document_folder(document):
    """The folder of the calling document, or None for a document never saved."""
    try:
        url = document.getURL() if document is not None and hasattr(document, "getURL") else ""
    except Exception:
        url = ""
    if url and url.startswith("file:"):
        return os.path.dirname(uno.fileUrlToSystemPath(url))
    return None


class Functions(unohelper.Base, XFunctions, XAddIn, XServiceName, XServiceInfo, XLocalizable):
    def __init__(self, context):
        self.context = context
        self.locale = Locale("en", "US", "")
        self.functions = elyblock_sheet.Functions()
        self.table = {f["name"]: f for f in self.functions.table["functions"]}

    # ---- the worksheet functions (XFunctions) ----
    def _call(self, name, document, args, result):
        try:
            value = self.functions.call(name, args, _document_folder(document))
        except elyblock_sheet.Failure as failure:
            return self._failed(failure, result)
        except Exception as e:  # a bug of ours must not take the spreadsheet down
            return self._failed(elyblock_sheet.Failure(f"{type(e).__name__}: {e}"), result)
        if result == "array":
            return tuple(tuple(row) for row in value)
        return value

    @staticmethod
    def _failed(failure, result):
        if failure.kind == "num" and result == "number":
            return math.nan
        if failure.kind == "num" and result == "array":
            return ((math.nan,),)
        raise RuntimeException(failure.message, None)

    def _message(self, document, func_name, *arguments):
        try:
            name = elyblock_sheet.text_argument(func_name, "func_name")
            return self.functions.message(name, list(arguments), _document_folder(document))
        except elyblock_sheet.Failure as failure:
            return failure.message
        except Exception as e:
            return f"{type(e).__name__}: {e}"

    # ---- XAddIn: names and texts of the Function Wizard, from functions.json ----
    def getProgrammaticFuntionName(self, display_name):  # sic: the interface spells it so
        name = display_name.upper()
        return name if name in self.table else ""

    def getDisplayFunctionName(self, name):
        return name if name in self.table else ""

    def getFunctionDescription(self, name):
        return self.table[name]["summary"] if name in self.table else ""

    def _argument(self, name, index):
        # Calc counts the hidden document argument: argument 0 of the table is method argument 1.
        arguments = self.table[name]["arguments"] if name in self.table else []
        return arguments[index - 1] if 1 <= index <= len(arguments) else None

    def getDisplayArgumentName(self, name, index):
        argument = self._argument(name, index)
        return argument["name"] if argument else ""

    def getArgumentDescription(self, name, index):
        argument = self._argument(name, index)
        return argument["description"] if argument else ""

    def getProgrammaticCategoryName(self, name):
        return CATEGORY

    def getDisplayCategoryName(self, name):
        return CATEGORY

    # ---- XServiceName, XServiceInfo, XLocalizable ----
    def getServiceName(self):
        return IMPLEMENTATION

    def getImplementationName(self):
        return IMPLEMENTATION

    def supportsService(self, name):
        return name in SERVICES

    def getSupportedServiceNames(self):
        return SERVICES

    def setLocale(self, locale):
        self.locale = locale

    def getLocale(self):
        return self.locale


def _method(spec):
    """The UNO method of one function of the table: Calc passes the document, then the arguments,
    the repeated last one as a sequence."""
    name, result = spec["name"], spec["result"]
    repeated = any(a["kind"] in elyblock_sheet.REPEATED for a in spec["arguments"])

    def method(self, document, *args):
        flat = [*args[:-1], *args[-1]] if repeated else list(args)
        if name == "ELYMESSAGE":
            return self._message(document, *flat)
        return self._call(name, document, flat, result)

    method.__name__ = name
    return method


for _spec in elyblock_sheet.load_table()["functions"]:
    setattr(Functions, _spec["name"], _method(_spec))

g_ImplementationHelper = unohelper.ImplementationHelper()
g_ImplementationHelper.addImplementation(Functions, IMPLEMENTATION, SERVICES)
