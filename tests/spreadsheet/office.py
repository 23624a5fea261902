"""A headless LibreOffice for the Calc tests: a fresh user profile, the add-in installed with
unopkg, soffice started on a pipe and reached over UNO. Used by test_calc.py.

unopkg refuses to run as root without --shared/--bundled; as root it is run as the user
'nobody' (setpriv) on a profile that user owns, when nobody can read the extension; otherwise
the extension is added over UNO (ExtensionManager) and soffice restarted.
"""
import os
import shutil
import subprocess
import sys
import time
import uuid

SOFFICE = shutil.which("soffice") or "/usr/bin/soffice"
UNOPKG = shutil.which("unopkg") or "/usr/bin/unopkg"
NOBODY = 65534


def skip(reason):
    print(f"skipped: {reason}")
    sys.exit(77)


def import_uno():
    try:
        import uno  # noqa: F401  (python3-uno, Debian's /usr/bin/python3 only)
    except ImportError:
        skip("python3-uno is not installed (scripts/install-deps installs it)")
    if not os.path.exists(SOFFICE) or not os.path.exists(UNOPKG):
        skip("LibreOffice (soffice, unopkg) not found; scripts/install-deps installs libreoffice-calc-nogui")
    import uno
    return uno


def file_url(path):
    import uno
    return uno.systemPathToFileUrl(os.path.abspath(path))


class Office:
    """``with Office(work_dir, oxt) as office:`` a running soffice with the extension installed;
    ``office.desktop``, ``office.load(path)``."""

    def __init__(self, work_dir, oxt):
        self.work_dir = os.path.abspath(work_dir)
        self.oxt = os.path.abspath(oxt)
        self.profile = os.path.join(self.work_dir, "profile")
        self.home = os.path.join(self.work_dir, "home")
        self.process = None
        self.install_method = None
        self.pipe = f"elyblock_test_{uuid.uuid4().hex[:12]}"

    # ---- set-up ----
    def __enter__(self):
        import_uno()
        shutil.rmtree(self.work_dir, ignore_errors=True)
        os.makedirs(self.profile)
        os.makedirs(self.home)
        try:
            if self._install_with_unopkg():
                self.start()
            else:
                self.start()
                self._install_over_uno()
                self.stop()
                self.start()
        except BaseException:
            self.stop()
            raise
        return self

    def __exit__(self, *exc):
        self.stop()
        return False

    def _env(self):
        env = dict(os.environ, HOME=self.home, SAL_USE_VCLPLUGIN="svp")
        env.pop("DISPLAY", None)
        env.pop("WAYLAND_DISPLAY", None)
        return env

    def _install_with_unopkg(self):
        command = [UNOPKG, "add", f"-env:UserInstallation={file_url(self.profile)}", self.oxt]
        if os.geteuid() == 0:
            if not shutil.which("setpriv"):
                return False
            as_nobody = ["setpriv", f"--reuid={NOBODY}", f"--regid={NOBODY}", "--clear-groups"]
            readable = subprocess.run(as_nobody + ["test", "-r", self.oxt], capture_output=True)
            if readable.returncode != 0:
                return False
            for root, dirs, files in os.walk(self.work_dir):
                for name in dirs + files:
                    os.chown(os.path.join(root, name), NOBODY, NOBODY)
            os.chown(self.work_dir, NOBODY, NOBODY)
            command = as_nobody + command
        t = time.monotonic()
        result = subprocess.run(command, env=self._env(), capture_output=True, text=True, timeout=300)
        if result.returncode != 0:
            raise RuntimeError(f"unopkg add failed ({result.returncode}): {result.stdout}{result.stderr}")
        self.install_method = f"unopkg add ({time.monotonic() - t:.1f} s" + \
            (", as the user nobody)" if os.geteuid() == 0 else ")")
        return True

    def _install_over_uno(self):
        import unohelper
        from com.sun.star.task import XInteractionHandler
        from com.sun.star.ucb import XCommandEnvironment, XProgressHandler

        class Approve(unohelper.Base, XInteractionHandler):
            def handle(self, request):
                for continuation in request.getContinuations():
                    if "Approve" in continuation.getImplementationName() or hasattr(continuation, "select"):
                        continuation.select()
                        return

        class Progress(unohelper.Base, XProgressHandler):
            def push(self, status): pass
            def update(self, status): pass
            def pop(self): pass

        class Environment(unohelper.Base, XCommandEnvironment):
            def getInteractionHandler(self): return Approve()
            def getProgressHandler(self): return Progress()

        t = time.monotonic()
        manager = self.context.getValueByName("/singletons/com.sun.star.deployment.ExtensionManager")
        manager.addExtension(file_url(self.oxt), (), "user", None, Environment())
        self.install_method = f"ExtensionManager.addExtension over UNO ({time.monotonic() - t:.1f} s; " \
                              f"unopkg cannot run as root and the user nobody cannot read {self.oxt})"

    def start(self):
        import uno
        from com.sun.star.connection import NoConnectException
        accept = f"pipe,name={self.pipe};urp;StarOffice.ComponentContext"
        self.process = subprocess.Popen(
            [SOFFICE, "--headless", "--invisible", "--norestore", "--nodefault", "--nolockcheck", "--nologo",
             f"-env:UserInstallation={file_url(self.profile)}", f"--accept={accept}"],
            env=self._env(), stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
        local = uno.getComponentContext()
        resolver = local.ServiceManager.createInstanceWithContext("com.sun.star.bridge.UnoUrlResolver", local)
        deadline = time.monotonic() + 120
        while True:
            try:
                self.context = resolver.resolve(f"uno:pipe,name={self.pipe};urp;StarOffice.ComponentContext")
                break
            except NoConnectException:
                if self.process.poll() is not None:
                    raise RuntimeError(f"soffice exited with {self.process.returncode}: "
                                       f"{self.process.stderr.read().decode(errors='replace')}")
                if time.monotonic() > deadline:
                    raise RuntimeError("soffice did not accept a connection within 120 s")
                time.sleep(0.25)
        self.desktop = self.context.ServiceManager.createInstanceWithContext("com.sun.star.frame.Desktop", self.context)

    def stop(self):
        if self.process is None:
            return
        try:
            if getattr(self, "desktop", None) is not None:
                self.desktop.terminate()
        except Exception:
            pass  # the bridge goes down with the process
        try:
            self.process.wait(timeout=30)
        except subprocess.TimeoutExpired:
            self.process.kill()
            self.process.wait()
        self.process = None
        self.desktop = None

    # ---- documents ----
    def property_values(self, **values):
        from com.sun.star.beans import PropertyValue
        return tuple(PropertyValue(Name=k, Value=v) for k, v in values.items())

    def load(self, path):
        return self.desktop.loadComponentFromURL(file_url(path), "_blank", 0, self.property_values(Hidden=True))

    def new_sheet(self):
        return self.desktop.loadComponentFromURL("private:factory/scalc", "_blank", 0, self.property_values(Hidden=True))
