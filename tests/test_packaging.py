"""Packaging: a regular (wheel) install and the editable install both carry the plugins.

The built-in plugins folder installs as ``ctllint_plugins``; no top-level
module named ``plugins`` may reach anyone's path.
"""
import importlib.metadata
import os
import subprocess
import sys
import zipfile

import pytest

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
BUILTIN = {"wiring", "motor-control", "ratings", "behaviour"}


def test_editable_install_exposes_entry_points():
    eps = {ep.name: ep.value for ep in importlib.metadata.entry_points(group="ctllint")}
    assert BUILTIN <= set(eps)
    assert all(eps[name].startswith("ctllint_plugins.") for name in BUILTIN)
    import ctllint_plugins

    assert os.path.samefile(os.path.dirname(ctllint_plugins.__file__), os.path.join(ROOT, "plugins"))


def _copy(src, dst):
    """Build from a copy: setuptools writes build metadata into the folder it builds."""
    import shutil

    shutil.copytree(src, dst, ignore=shutil.ignore_patterns(".git", ".ci", "build", "*.egg-info", "__pycache__", ".pytest_cache", ".hypothesis", "tests", "fixtures"))
    return str(dst)


@pytest.fixture(scope="module")
def wheel(tmp_path_factory):
    out = tmp_path_factory.mktemp("wheel")
    src = _copy(ROOT, tmp_path_factory.mktemp("src") / "ctllint")
    proc = subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(out), src],
                          capture_output=True, text=True)
    if proc.returncode != 0:
        pytest.fail(f"pip wheel failed:\n{proc.stdout}\n{proc.stderr}")
    wheels = [f for f in os.listdir(out) if f.endswith(".whl")]
    assert len(wheels) == 1
    return os.path.join(out, wheels[0])


def test_wheel_holds_every_plugin_and_no_bare_plugins_package(wheel):
    names = zipfile.ZipFile(wheel).namelist()
    tops = {n.split("/")[0] for n in names}
    assert "plugins" not in tops
    # every module of the source tree, in every package, is in the wheel
    # (a package left out of pyproject.toml's list would be missing)
    root = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    for folder, installed in (("ctllint", "ctllint"), ("plugins", "ctllint_plugins")):
        for dirpath, dirnames, filenames in os.walk(os.path.join(root, folder)):
            dirnames[:] = [d for d in dirnames if d not in ("__pycache__", "site-example")]
            rel = os.path.relpath(dirpath, os.path.join(root, folder))
            for f in filenames:
                if f.endswith(".py"):
                    want = "/".join(p for p in (installed, "" if rel == "." else rel.replace(os.sep, "/"), f) if p)
                    assert want in names, f"{want} is not in the wheel"
    assert "ctllint_plugins/ratings/__init__.py" in names or "ctllint_plugins/ratings.py" in names
    assert not any(n.startswith("ctllint_plugins/site-example") or "site_example" in n for n in names)


def test_regular_install_runs_every_builtin_rule(wheel, tmp_path):
    target = tmp_path / "site"
    proc = subprocess.run([sys.executable, "-m", "pip", "install", "--no-deps", "-q", "--target", str(target), wheel], capture_output=True, text=True)
    assert proc.returncode == 0, proc.stderr
    code = ("import ctllint, ctllint_plugins, json; from ctllint.checking.host import PluginHost; h = PluginHost.create(); "
            "print(json.dumps({'core': ctllint.__file__, 'plugins': ctllint_plugins.__file__, "
            "'rules': sorted({r.plugin for r in h.rules.values()}), 'problems': [p.message for p in h.problems]}))")
    env = dict(os.environ, PYTHONPATH=str(target))
    proc = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env, cwd=str(tmp_path))
    assert proc.returncode == 0, proc.stderr
    import json

    info = json.loads(proc.stdout)
    assert info["core"].startswith(str(target)) and info["plugins"].startswith(str(target))
    assert BUILTIN <= set(info["rules"]) and not info["problems"]


def test_site_example_installs_with_its_entry_point(tmp_path):
    """The example site plugin installs as its own package and registers through the same group."""
    target = tmp_path / "site"
    proc = subprocess.run([sys.executable, "-m", "pip", "install", "--no-deps", "-q", "--target", str(target),
                           _copy(os.path.join(ROOT, "plugins", "site-example"), tmp_path / "src")], capture_output=True, text=True)
    assert proc.returncode == 0, proc.stderr
    env = dict(os.environ, PYTHONPATH=str(target))
    proc = subprocess.run([sys.executable, "-m", "ctllint", "rules"], capture_output=True, text=True, env=env, cwd=str(tmp_path))
    assert proc.returncode == 0, proc.stderr
    lines = [line.split() for line in proc.stdout.splitlines()]
    assert ["site-wire-numbers", "site-example", "warning"] == lines[[l[0] for l in lines].index("site-wire-numbers")][:3]
    assert any(l[0] == "site-tag-prefix" for l in lines)
