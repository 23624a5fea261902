"""`cmake --install` puts the package where Debian's python3 finds it under a prefix, and the
installed package loads the library of its own prefix (no LD_LIBRARY_PATH), wherever the
prefix is moved."""
import os
import pathlib
import subprocess
import sys

from conftest import BUILD_DIR, DEMO_PLANT, SOURCE_DIR, assert_same

CHECK = """
import json, elyblock
b = elyblock.Block({plant!r})
b.solve(current_density=1.7e4)
print(json.dumps({{"library": elyblock.library_path, "version": elyblock.__version__, "package": elyblock.__file__,
                  "voltage": b["cell.voltage"].hex()}}))
"""


def install(prefix):
    """The README's install command: everything, into a prefix."""
    cmake = os.environ.get("CMAKE_COMMAND", "cmake")
    subprocess.run([cmake, "--install", str(BUILD_DIR), "--prefix", str(prefix)], check=True, capture_output=True,
                   text=True)


def run_installed(site, cwd):
    env = {k: v for k, v in os.environ.items() if k not in ("ELYBLOCK_LIBRARY", "LD_LIBRARY_PATH", "PYTHONPATH")}
    env["PYTHONPATH"] = str(site)
    done = subprocess.run([sys.executable, "-c", CHECK.format(plant=str(DEMO_PLANT))], cwd=cwd, env=env,
                          capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    import json
    return json.loads(done.stdout)


def test_installed_package_uses_its_own_prefix(tmp_path, reference):
    prefix = tmp_path / "prefix"
    install(prefix)
    site = prefix / "lib" / "python3" / "dist-packages"
    installed = sorted(p.name for p in (site / "elyblock").iterdir())
    sources = sorted(p.name for p in (SOURCE_DIR / "adapters" / "python" / "elyblock").glob("*.py"))
    assert installed == sorted(sources + ["_build_info.py"])

    moved = tmp_path / "moved"
    prefix.rename(moved)  # the package finds the library relative to itself
    site = moved / "lib" / "python3" / "dist-packages"
    result = run_installed(site, cwd=tmp_path)
    assert pathlib.Path(result["package"]).is_relative_to(moved)
    assert pathlib.Path(result["library"]).resolve().is_relative_to(moved.resolve())
    assert not pathlib.Path(result["library"]).resolve().is_relative_to(BUILD_DIR.resolve())

    reference.create(DEMO_PLANT)
    reference.set("in.current_density", 1.7e4)
    reference.solve()
    assert_same(float.fromhex(result["voltage"]), reference.get("cell.voltage"))


def test_build_tree_package_uses_the_build_library(tmp_path):
    result = run_installed(BUILD_DIR / "adapters" / "python", cwd=tmp_path)
    assert os.path.samefile(result["library"], BUILD_DIR / "abi" / "libelyblock.so.1")
    import elyblock
    assert result["version"] == elyblock.__version__
