#!/usr/bin/env python3
"""Checks of the FMUs that `elyblock fmu` makes (adapters/fmi), one case per CTest test:

  layout         the zip of the demo plant's two FMUs: exactly the model description, the binary under
                 binaries/linux64 (FMI 2) or binaries/x86_64-linux (FMI 3), resources/plant.json, and
                 with ELY_FMU_WINDOWS the Windows binary under binaries/win64 or binaries/x86_64-windows
  schema         both model descriptions against the official XML schemas (xmllint), looked for at
                 ../shared/fmi-schema beside the source tree; skipped (exit 77) when absent
  rules          what the schemas cannot express: causality/variability/initial and start combinations,
                 limits, units defined and their SI base-unit exponents (checked with python3-pint),
                 ModelStructure, the token, value references pinned across versions
  every_example  every example plant packed as FMI 2 and FMI 3: rules and schema
  binary         ldd of the binaries (C runtime only) and their exports (exactly the standard's functions);
                 the Windows binaries' import and export tables (mingw objdump -p): Windows system DLLs only
  cli_errors     `elyblock fmu` refusing what it cannot pack, with the exit status and message, leaving no
                 file; packing Linux only (saying so on stderr) when no Windows binary is found

Usage: check_fmus.py CASE ELYBLOCK_CLI SOURCE_DIR FMU_BUILD_DIR WORK_DIR SANITIZER
Environment: ELY_FMU_WINDOWS_DIR, the folder of the Windows binaries when the build packs them
(ELY_FMU_WINDOWS), else empty; ELY_MINGW_OBJDUMP, mingw's objdump.
"""
import os
import re
import shutil
import subprocess
import sys
import uuid
import xml.etree.ElementTree as ET
import zipfile

CASE, CLI, SOURCE, FMU_DIR, WORK, SANITIZE = sys.argv[1:7]
# The official schemas sit beside the source tree; ELY_FMI_SCHEMA_DIR points elsewhere (a worktree
# whose parent folder has no shared/).
SCHEMAS = os.environ.get("ELY_FMI_SCHEMA_DIR") or os.path.normpath(os.path.join(os.path.abspath(SOURCE), "..", "shared",
                                                                                  "fmi-schema"))
SKIP = 77
failures = []
WINDOWS_DIR = os.environ.get("ELY_FMU_WINDOWS_DIR", "")


def expect(ok, what):
    print(("ok - " if ok else "not ok - ") + what)
    if not ok:
        failures.append(what)


def demo_fmu(version):
    return os.path.join(FMU_DIR, f"demo-plant-fmi{version}.fmu")


def platform(version):
    return "linux64" if version == 2 else "x86_64-linux"


def windows_platform(version):
    return "win64" if version == 2 else "x86_64-windows"


# ---- schema -------------------------------------------------------------------------------------

def validate(xml_text, version, label):
    schema = os.path.join(SCHEMAS, f"fmi{version}", f"fmi{version}ModelDescription.xsd")
    p = subprocess.run(["xmllint", "--noout", "--schema", schema, "-"], input=xml_text, capture_output=True, text=True)
    expect(p.returncode == 0, f"{label}: valid against {os.path.relpath(schema, SOURCE)}" +
           ("" if p.returncode == 0 else "\n" + p.stderr[-2000:]))


def schemas_present():
    return os.path.isfile(os.path.join(SCHEMAS, "fmi2", "fmi2ModelDescription.xsd")) and \
        os.path.isfile(os.path.join(SCHEMAS, "fmi3", "fmi3ModelDescription.xsd"))


# ---- rules the schemas cannot express ------------------------------------------------------------

# Value references depend on the name alone and must never change for a name (an importer's saved
# connections use them): these were the values of the first release of the FMUs.
PINNED = {"in.power": 806761769, "in.current_density": 1704192058, "in.mode_request": 1336008653,
          "param.heat_capacity": 322862975, "cell.voltage": 203855497, "stack.temperature": 592956591}

TOKEN_NAMESPACE = uuid.UUID(bytes=bytes([0x6b, 0x1e, 0x4f, 0x0a, 0x93, 0x2d, 0x4c, 0x51, 0xa7, 0x0e,
                                         0x5c, 0x21, 0x8d, 0x3f, 0x76, 0xe4]))

BASE = ["kg", "m", "s", "A", "K", "mol", "cd", "rad"]
PINT_DIMENSIONS = {"[mass]": "kg", "[length]": "m", "[time]": "s", "[current]": "A", "[temperature]": "K",
                   "[substance]": "mol", "[luminosity]": "cd"}


def pint_expression(unit):
    if unit in ("1", "mol/mol", "kg/kg"):
        return "dimensionless"
    text = unit.replace("%", "percent")
    text = re.sub(r"([A-Za-z])\^?(-?\d+)", r"\1**\2", text)
    return re.sub(r"(?<=[\w)]) +(?=[\w(])", "*", text)


def check_units(root, label):
    try:
        import pint
    except ImportError:
        print("note - python3-pint is not installed: base-unit exponents not checked")
        return
    ureg = pint.UnitRegistry()
    for unit in root.find("UnitDefinitions"):
        name = unit.get("name")
        base = unit.find("BaseUnit")
        exponents = {b: int(base.get(b, "0")) for b in BASE} if base is not None else {b: 0 for b in BASE}
        factor = float(base.get("factor", "1")) if base is not None else 1.0
        q = ureg.Quantity(1.0, pint_expression(name))
        dims = {PINT_DIMENSIONS[d]: int(e) for d, e in q.dimensionality.items()}
        want = {b: dims.get(b, 0) for b in BASE}
        magnitude = q.to_base_units().magnitude
        expect(want == exponents and abs(magnitude - factor) <= 1e-12 * abs(factor),
               f"{label}: unit {name}: BaseUnit {exponents} factor {factor} (pint: {want}, {magnitude})")
        for display in unit.findall("DisplayUnit"):
            dname = display.get("name")
            f, o = float(display.get("factor", "1")), float(display.get("offset", "0"))
            try:
                converted = ureg.Quantity(2.0, pint_expression(name)).to(pint_expression(dname)).magnitude
            except Exception as e:  # a display name pint does not read
                print(f"note - {label}: display unit {dname} of {name} not checked ({type(e).__name__})")
                continue
            expect(abs(converted - (2.0 * f + o)) <= 1e-9 * max(1.0, abs(converted)),
                   f"{label}: display unit {dname} of {name}: 2 {name} = {2.0 * f + o} {dname} (pint: {converted})")


def check_rules(xml_text, version, plant_text, binary_stem, label):
    root = ET.fromstring(xml_text)
    expect(root.get("fmiVersion") == f"{version}.0", f"{label}: fmiVersion {version}.0")
    token_attr = "guid" if version == 2 else "instantiationToken"
    name = f"elyblock FMI {version} {root.get('version')}\n" + plant_text
    token = "{" + str(uuid.uuid5(TOKEN_NAMESPACE, name)) + "}"
    expect(root.get(token_attr) == token, f"{label}: {token_attr} is the name-based UUID of the plant ({token})")
    expect(root.get("generationTool", "").startswith("elyblock "), f"{label}: generation tool is ours")
    expect(re.fullmatch(r"\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ", root.get("generationDateAndTime", "")) is not None,
           f"{label}: generation date and time")
    cs = root.find("CoSimulation")
    expect(cs is not None and cs.get("modelIdentifier") == binary_stem,
           f"{label}: modelIdentifier {cs.get('modelIdentifier')} names the binary {binary_stem}.so")
    flags = ({"canHandleVariableCommunicationStepSize": "true", "canGetAndSetFMUstate": "true",
              "canSerializeFMUstate": "true", "canNotUseMemoryManagementFunctions": "true"} if version == 2 else
             {"canHandleVariableCommunicationStepSize": "true", "canGetAndSetFMUState": "true",
              "canSerializeFMUState": "true", "hasEventMode": "false"})
    for flag, value in flags.items():
        expect(cs.get(flag) == value, f"{label}: CoSimulation {flag}={value}")
    categories = [c.get("name") for c in root.find("LogCategories")]
    expect("logStatusError" in categories and "logEvents" in categories, f"{label}: log categories {categories}")
    expect(root.find("DefaultExperiment") is not None, f"{label}: default experiment")

    units = {u.get("name"): {d.get("name") for d in u.findall("DisplayUnit")} for u in root.find("UnitDefinitions")}
    variables = []  # (index from 1, name, vr, causality, variability, initial, attributes of the value)
    for i, v in enumerate(root.find("ModelVariables"), start=1):
        attrs = dict(v.find("Real").attrib) if version == 2 else dict(v.attrib)
        variables.append((i, v.get("name"), int(v.get("valueReference")), v.get("causality", "local"),
                          v.get("variability", "continuous"), v.get("initial"), attrs))
    names = [v[1] for v in variables]
    refs = [v[2] for v in variables]
    expect(len(set(names)) == len(names), f"{label}: {len(names)} variable names, all different")
    expect(len(set(refs)) == len(refs), f"{label}: value references all different")
    for n, ref in PINNED.items():
        if n in names:
            expect(refs[names.index(n)] == ref, f"{label}: {n} keeps value reference {ref}")
    problems = []
    for i, n, ref, causality, variability, initial, a in variables:
        start = a.get("start")
        if causality == "independent":
            if version != 3 or n != "time" or ref != 0 or start is not None or initial is not None:
                problems.append(f"{n}: the independent variable must be FMI 3's time, VR 0, no start")
        elif causality == "input":
            if variability not in ("continuous", "discrete") or initial is not None or start is None:
                problems.append(f"{n}: input with variability {variability}, initial {initial}, start {start}")
        elif causality == "parameter":
            if variability not in ("fixed", "tunable") or initial not in (None, "exact") or start is None:
                problems.append(f"{n}: parameter with variability {variability}, initial {initial}, start {start}")
        elif causality == "calculatedParameter":
            if variability not in ("fixed", "tunable") or initial not in (None, "calculated") or start is not None:
                problems.append(f"{n}: calculated parameter with variability {variability}, initial {initial}")
        elif causality == "output":
            if variability not in ("continuous", "discrete") or initial not in (None, "calculated") or start is not None:
                problems.append(f"{n}: output with variability {variability}, initial {initial}, start {start}")
        else:
            problems.append(f"{n}: causality {causality}")
        lo, hi, nominal = (float(a[k]) if k in a else None for k in ("min", "max", "nominal"))
        if start is not None:
            s = float(start)
            if (lo is not None and s < lo) or (hi is not None and s > hi):
                problems.append(f"{n}: start {s} outside [{lo}, {hi}]")
        if lo is not None and hi is not None and lo > hi:
            problems.append(f"{n}: min {lo} > max {hi}")
        if nominal is not None and not nominal > 0:
            problems.append(f"{n}: nominal {nominal} not > 0")
        unit, display = a.get("unit"), a.get("displayUnit")
        if unit is not None and unit not in units:
            problems.append(f"{n}: unit {unit} not in UnitDefinitions")
        if display is not None and (unit not in units or display not in units[unit]):
            problems.append(f"{n}: display unit {display} not defined for {unit}")
    expect(not problems, f"{label}: every variable follows the standard's rules" +
           ("" if not problems else ":\n  " + "\n  ".join(problems[:20])))
    if version == 3:
        expect(sum(v[3] == "independent" for v in variables) == 1, f"{label}: exactly one independent variable")

    outputs = [v for v in variables if v[3] == "output"]
    initial = [v for v in variables if v[3] in ("output", "calculatedParameter")]
    ms = root.find("ModelStructure")
    if version == 2:
        listed = [int(u.get("index")) for u in ms.find("Outputs")]
        expect(listed == [v[0] for v in outputs], f"{label}: ModelStructure/Outputs lists the {len(outputs)} outputs")
        listed = [int(u.get("index")) for u in ms.find("InitialUnknowns")]
        expect(listed == [v[0] for v in initial],
               f"{label}: InitialUnknowns lists the outputs and calculated parameters, in order")
    else:
        listed = [int(u.get("valueReference")) for u in ms.findall("Output")]
        expect(listed == [v[2] for v in outputs], f"{label}: ModelStructure/Output lists the {len(outputs)} outputs")
        listed = [int(u.get("valueReference")) for u in ms.findall("InitialUnknown")]
        expect(listed == [v[2] for v in initial], f"{label}: InitialUnknown lists the outputs and calculated parameters")
    check_units(root, label)


# ---- cases ----------------------------------------------------------------------------------------

def read_fmu(path):
    with zipfile.ZipFile(path) as z:
        expect(z.testzip() is None, f"{os.path.basename(path)}: every member reads back (CRC)")
        return {name: z.read(name) for name in z.namelist()}


def case_layout():
    plant = open(os.path.join(SOURCE, "examples", "demo-plant.json"), "rb").read()
    for version in (2, 3):
        members = read_fmu(demo_fmu(version))
        binary = f"binaries/{platform(version)}/demo_plant.so"
        windows_binary = f"binaries/{windows_platform(version)}/demo_plant.dll"
        wanted = ["modelDescription.xml", binary, "resources/plant.json"] + ([windows_binary] if WINDOWS_DIR else [])
        expect(sorted(members) == sorted(wanted), f"FMI {version}: members {sorted(members)}")
        expect(members.get("resources/plant.json") == plant, f"FMI {version}: resources/plant.json is the plant as given")
        built = open(os.path.join(FMU_DIR, f"elyblock-fmi{version}.so"), "rb").read()
        expect(members.get(binary) == built, f"FMI {version}: {binary} is elyblock-fmi{version}.so")
        if WINDOWS_DIR:
            built = open(os.path.join(WINDOWS_DIR, f"elyblock-fmi{version}.dll"), "rb").read()
            expect(members.get(windows_binary) == built, f"FMI {version}: {windows_binary} is elyblock-fmi{version}.dll")
        else:
            print(f"note - FMI {version}: no Windows binary expected (ELY_FMU_WINDOWS is off)")


def case_schema():
    if not schemas_present():
        print(f"skipped: the FMI schemas are not at {SCHEMAS} (../shared/fmi-schema beside the source tree)")
        sys.exit(SKIP)
    for version in (2, 3):
        validate(read_fmu(demo_fmu(version))["modelDescription.xml"].decode(), version, f"demo plant, FMI {version}")


def case_rules():
    for version in (2, 3):
        m = read_fmu(demo_fmu(version))
        check_rules(m["modelDescription.xml"].decode(), version, m["resources/plant.json"].decode(), "demo_plant",
                    f"demo plant, FMI {version}")


def case_every_example():
    shutil.rmtree(WORK, ignore_errors=True)
    os.makedirs(WORK)
    examples = os.path.join(SOURCE, "examples")
    plants = sorted([os.path.join(examples, f) for f in os.listdir(examples) if f.endswith(".json")] +
                    [os.path.join(examples, "minimal", f) for f in os.listdir(os.path.join(examples, "minimal"))
                     if f.endswith(".json")])
    validating = schemas_present()
    if not validating:
        print(f"note - the FMI schemas are not at {SCHEMAS}: schema validation skipped, rules checked")
    for plant in plants:
        stem = os.path.splitext(os.path.basename(plant))[0]
        for version in (2, 3):
            out = os.path.join(WORK, f"{stem}-fmi{version}.fmu")
            windows = ["--windows-binaries", WINDOWS_DIR] if WINDOWS_DIR else ["--no-windows"]
            p = subprocess.run([CLI, "fmu", plant, "--fmi", str(version), "--output", out,
                                "--binaries", FMU_DIR] + windows, capture_output=True, text=True)
            label = f"{os.path.relpath(plant, SOURCE)}, FMI {version}"
            expect(p.returncode == 0, f"{label}: elyblock fmu" + ("" if p.returncode == 0 else ": " + p.stderr))
            if p.returncode != 0:
                continue
            m = read_fmu(out)
            identifier = re.sub(r"[^A-Za-z0-9_]", "_", stem)
            expect(f"binaries/{platform(version)}/{identifier}.so" in m, f"{label}: binary {identifier}.so")
            if WINDOWS_DIR:
                expect(f"binaries/{windows_platform(version)}/{identifier}.dll" in m, f"{label}: binary {identifier}.dll")
            xml_text = m["modelDescription.xml"].decode()
            if validating:
                validate(xml_text, version, label)
            check_rules(xml_text, version, m["resources/plant.json"].decode(), identifier, label)


# Every function of the standard's header (fmi2Functions.h / fmi3Functions.h), by name.
FMI2_FUNCTIONS = """GetTypesPlatform GetVersion SetDebugLogging Instantiate FreeInstance SetupExperiment
EnterInitializationMode ExitInitializationMode Terminate Reset GetReal GetInteger GetBoolean GetString SetReal
SetInteger SetBoolean SetString GetFMUstate SetFMUstate FreeFMUstate SerializedFMUstateSize SerializeFMUstate
DeSerializeFMUstate GetDirectionalDerivative EnterEventMode NewDiscreteStates EnterContinuousTimeMode
CompletedIntegratorStep SetTime SetContinuousStates GetDerivatives GetEventIndicators GetContinuousStates
GetNominalsOfContinuousStates SetRealInputDerivatives GetRealOutputDerivatives DoStep CancelStep GetStatus
GetRealStatus GetIntegerStatus GetBooleanStatus GetStringStatus""".split()
FMI3_FUNCTIONS = """GetVersion SetDebugLogging InstantiateModelExchange InstantiateCoSimulation
InstantiateScheduledExecution FreeInstance EnterInitializationMode ExitInitializationMode EnterEventMode Terminate
Reset GetFloat32 GetFloat64 GetInt8 GetUInt8 GetInt16 GetUInt16 GetInt32 GetUInt32 GetInt64 GetUInt64 GetBoolean
GetString GetBinary GetClock SetFloat32 SetFloat64 SetInt8 SetUInt8 SetInt16 SetUInt16 SetInt32 SetUInt32 SetInt64
SetUInt64 SetBoolean SetString SetBinary SetClock GetNumberOfVariableDependencies GetVariableDependencies
GetFMUState SetFMUState FreeFMUState SerializedFMUStateSize SerializeFMUState DeserializeFMUState
GetDirectionalDerivative GetAdjointDerivative EnterConfigurationMode ExitConfigurationMode GetIntervalDecimal
GetIntervalFraction GetShiftDecimal GetShiftFraction SetIntervalDecimal SetIntervalFraction SetShiftDecimal
SetShiftFraction EvaluateDiscreteStates UpdateDiscreteStates EnterContinuousTimeMode CompletedIntegratorStep SetTime
SetContinuousStates GetContinuousStateDerivatives GetEventIndicators GetContinuousStates
GetNominalsOfContinuousStates GetNumberOfEventIndicators GetNumberOfContinuousStates EnterStepMode
GetOutputDerivatives DoStep ActivateModelPartition""".split()
ALLOWED_LIBRARIES = ("linux-vdso.so", "libc.so", "libm.so", "libdl.so", "libpthread.so", "ld-linux-x86-64.so")


def case_binary():
    if SANITIZE:
        print(f"skipped: a sanitizer build ({SANITIZE}) links the FMU binaries with the shared sanitizer runtime "
              "instead of the static C++ runtime; the plain build (scripts/test) checks their dependencies")
        sys.exit(SKIP)
    for version, functions in ((2, FMI2_FUNCTIONS), (3, FMI3_FUNCTIONS)):
        binary = os.path.join(FMU_DIR, f"elyblock-fmi{version}.so")
        ldd = subprocess.run(["ldd", binary], capture_output=True, text=True, check=True).stdout
        libraries = [line.split()[0] for line in ldd.splitlines() if line.strip()]
        strange = [lib for lib in libraries if not os.path.basename(lib).startswith(ALLOWED_LIBRARIES)]
        expect(not strange, f"FMI {version}: ldd lists only the C runtime ({', '.join(libraries)})")
        nm = subprocess.run(["nm", "-D", "--defined-only", binary], capture_output=True, text=True, check=True).stdout
        exported = sorted(line.split()[-1] for line in nm.splitlines() if line.strip())
        wanted = sorted(f"fmi{version}{f}" for f in functions)
        expect(exported == wanted, f"FMI {version}: exports exactly the {len(wanted)} functions of the standard" +
               ("" if exported == wanted else f": extra {sorted(set(exported) - set(wanted))[:10]}, "
                                              f"missing {sorted(set(wanted) - set(exported))}"))
        if WINDOWS_DIR:
            check_windows_binary(version, functions)


# The Windows binary: imports from Windows system DLLs only (the C runtime msvcrt.dll and KERNEL32.dll,
# as `ldd` for Linux), exports exactly the standard's functions. Read from the demo FMU itself.
WINDOWS_SYSTEM_DLLS = ("kernel32.dll", "msvcrt.dll")


def check_windows_binary(version, functions):
    objdump = os.environ.get("ELY_MINGW_OBJDUMP", "")
    if not objdump or not os.path.isfile(objdump):
        print(f"note - FMI {version}: x86_64-w64-mingw32-objdump not found: the Windows binary's tables are not checked")
        return
    member = f"binaries/{windows_platform(version)}/demo_plant.dll"
    os.makedirs(WORK, exist_ok=True)
    dll = os.path.join(WORK, f"demo_plant_fmi{version}.dll")
    with open(dll, "wb") as f:
        f.write(read_fmu(demo_fmu(version))[member])
    text = subprocess.run([objdump, "-p", dll], capture_output=True, text=True, check=True).stdout
    imports = sorted({m.group(1) for m in re.finditer(r"^\s*DLL Name: (\S+)", text, re.M)})
    expect(imports and all(d.lower() in WINDOWS_SYSTEM_DLLS for d in imports),
           f"FMI {version}: {member} imports from Windows system DLLs only ({', '.join(imports)})")
    exported = []
    table = text.split("[Ordinal/Name Pointer] Table", 1)
    for line in (table[1].splitlines()[1:] if len(table) == 2 else []):
        m = re.match(r"^\s*\[\s*\d+\]\s+(\S+)\s*$", line)
        if not m:
            break
        exported.append(m.group(1))
    wanted = sorted(f"fmi{version}{f}" for f in functions)
    expect(sorted(exported) == wanted, f"FMI {version}: {member} exports exactly the {len(wanted)} functions of the "
           "standard" + ("" if sorted(exported) == wanted else f": extra {sorted(set(exported) - set(wanted))[:10]}, "
                                                                 f"missing {sorted(set(wanted) - set(exported))}"))


def case_cli_errors():
    shutil.rmtree(WORK, ignore_errors=True)
    os.makedirs(WORK)
    demo = os.path.join(SOURCE, "examples", "demo-plant.json")
    bad_plant = os.path.join(WORK, "bad.json")
    with open(bad_plant, "w") as f:
        f.write('{"technology": "pem", "stack": {"cells": -4, "active_area": 0.1}, "operating": {"spec": "current_density"}}')

    def fmu(*args):
        return subprocess.run([CLI, "fmu", *args], capture_output=True, text=True)

    fake = os.path.join(WORK, "fake-windows")  # an elyblock-fmi3.dll that is no DLL
    os.makedirs(fake)
    with open(os.path.join(fake, "elyblock-fmi3.dll"), "wb") as f:
        f.write(b"\x7fELF not a Windows DLL")

    cases = [
        ((os.path.join(WORK, "missing.json"), "--fmi", "2", "--binaries", FMU_DIR), 1, "cannot read the plant description"),
        ((bad_plant, "--fmi", "3", "--binaries", FMU_DIR, "--output", os.path.join(WORK, "bad.fmu")), 1, "$.stack.cells"),
        ((demo, "--fmi", "4"), 2, "--fmi: 4 not in {2,3}"),
        ((demo,), 2, "--fmi is required"),
        ((demo, "--fmi", "2", "--binaries", os.path.join(WORK, "nowhere")), 1, "elyblock-fmi2.so is not in"),
        ((demo, "--fmi", "2", "--binaries", FMU_DIR, "--model-identifier", "2bad-name"), 2,
         "--model-identifier: 2bad-name is not a C identifier"),
        ((demo, "--fmi", "2", "--binaries", FMU_DIR, "--output", os.path.join(WORK, "no", "such", "x.fmu")), 1,
         "cannot write " + os.path.join(WORK, "no", "such", "x.fmu") + ":"),
        ((demo, "--fmi", "2", "--binaries", FMU_DIR, "--windows-binaries", os.path.join(WORK, "nowhere")), 1,
         "the Windows FMU binary elyblock-fmi2.dll is not in"),
        ((demo, "--fmi", "3", "--binaries", FMU_DIR, "--windows-binaries", fake, "--output", os.path.join(WORK, "f.fmu")),
         1, os.path.join(fake, "elyblock-fmi3.dll") + " is not a Windows DLL"),
        ((demo, "--fmi", "2", "--no-windows", "--windows-binaries", fake), 2, "--windows-binaries excludes --no-windows"),
    ]
    for args, status, text in cases:
        p = fmu(*args)
        expect(p.returncode == status and text in p.stderr and p.stdout == "",
               f"elyblock fmu {' '.join(os.path.basename(a) for a in args)}: exit {status}, says '{text}' "
               f"(got {p.returncode}: {p.stderr.strip()})")
    left = [f for f in os.listdir(WORK) if f.endswith((".fmu", ".partial"))]
    expect(not left, f"no FMU or partial file is left behind ({left})")

    # No Windows binary beside the Linux ones: the FMU is made with Linux only, and stderr says so;
    # --no-windows makes the same without the note.
    made = os.path.join(WORK, "made")
    os.makedirs(made)
    for extra, note in (((), True), (("--no-windows",), False)):
        out = os.path.join(made, "linux-only.fmu")
        p = fmu(demo, "--fmi", "3", "--binaries", FMU_DIR, "--output", out, *extra)
        members = sorted(read_fmu(out)) if p.returncode == 0 else []
        said = "no Windows binary (elyblock-fmi3.dll is not in" in p.stderr and "Linux binary only" in p.stderr
        expect(p.returncode == 0 and members == ["binaries/x86_64-linux/demo_plant.so", "modelDescription.xml",
                                                 "resources/plant.json"] and said == note and
               (note or p.stderr == "") and "binaries/x86_64-linux\n" in p.stdout,
               f"elyblock fmu {' '.join(extra)} without a Windows binary: Linux only, "
               f"{'says so on stderr' if note else 'nothing on stderr'} (got {p.returncode}, {members}, {p.stderr.strip()})")


{"layout": case_layout, "schema": case_schema, "rules": case_rules, "every_example": case_every_example,
 "binary": case_binary, "cli_errors": case_cli_errors}[CASE]()
print(f"{len(failures)} failed")
sys.exit(1 if failures else 0)
