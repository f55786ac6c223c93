"""Meta-tests: every rule documented and tested, the README's rule list current, hooks documented."""
import inspect
import os
import re

import pytest

from ctllint.checking import hookspecs
from ctllint.commands.rules import rules_table
from ctllint.checking.host import PluginHost
from ctllint.testing import case_files, load_cases

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
RULES_DIR = os.path.join(ROOT, "tests", "rules")

# The catalogue of the shared RULES.md: plugin -> rule names. Rule names are public identifiers.
CATALOGUE = {
    "wiring": ["unknown-device", "unknown-part", "contact-count", "coil-missing", "coil-duplicate", "open-circuit",
               "loads-in-series", "short-circuit", "supply-cross", "voltage-mismatch", "grounded-side-switching",
               "dangling-wire", "unused-device"],
    "motor-control": ["stop-normally-closed", "stop-in-series", "overload-in-coil-path", "seal-in", "switch-fan-out",
                      "interlock", "emergency-stop", "auto-restart", "oscillation",
                      "safety-relay-feedback"],  # our own addition, for safety relay modules (README)
    "ratings": ["contact-rating", "overload-setting", "motor-overload", "control-transformer", "transformer-protection",
                "vacuum-contactor", "inductive-on-electronic-output"],
    "behaviour": ["expectation", "unsettled"],
}
SEVERITY = {"dangling-wire": "warning", "unused-device": "info", "switch-fan-out": "warning", "auto-restart": "warning",
            "vacuum-contactor": "info", "inductive-on-electronic-output": "warning"}


@pytest.fixture(scope="module")
def host():
    h = PluginHost.create()
    assert not h.problems, h.problems
    return h


def test_catalogue_is_registered(host):
    # every rule of the catalogue, by its public name, in its plugin, at its severity (a renamed
    # or re-graded rule fails); a rule added beyond it is checked by the tests below like any other
    for plugin, names in CATALOGUE.items():
        got = {n for n, r in host.rules.items() if r.plugin == plugin}
        assert set(names) <= got, (plugin, sorted(set(names) - got))
    for plugin, names in CATALOGUE.items():
        for name in names:
            assert str(host.rules[name].severity) == SEVERITY.get(name, "error"), name


BUILTIN_RULES = sorted(n for n, r in PluginHost.create().rules.items() if r.plugin in CATALOGUE)


@pytest.mark.parametrize("name", BUILTIN_RULES)
def test_rule_is_documented(host, name):
    rule = host.rules[name]
    assert rule.summary and len(rule.summary) < 120
    assert len(rule.doc.strip()) > 80, "doc should say why the rule exists"
    assert rule.source.strip()
    assert rule.failing is not None and rule.failing.yaml.strip()
    assert rule.passing is not None and rule.passing.yaml.strip()
    for opt_name, opt in rule.options.items():
        assert opt.doc, opt_name
        assert opt.validate(opt.default) is None


@pytest.mark.parametrize("name", BUILTIN_RULES)
def test_rule_has_cases(name):
    path = os.path.join(RULES_DIR, f"{name}.yaml")
    assert os.path.exists(path), f"no case file for {name}"
    cases = load_cases(path)
    assert all(c.rule == name for c in cases)
    failing = [c for c in cases if c.failing]
    passing = [c for c in cases if not c.failing]
    assert len(failing) >= 2, f"{name}: needs at least two failing cases"
    assert len(passing) >= 2, f"{name}: needs at least two passing cases"


def test_case_files_name_known_rules(host):
    for f in case_files(RULES_DIR):
        for c in load_cases(f):
            assert os.path.basename(f) == f"{c.rule}.yaml"
            for finding in c.findings:
                assert finding["rule"] in host.rules or finding["rule"] in ("format", "plugin-error", "suppression"), (f, finding)


def test_readme_rule_list_is_current(host):
    with open(os.path.join(ROOT, "README.md"), encoding="utf-8") as handle:
        readme = handle.read()
    m = re.search(r"<!-- rules:start -->\n(.*?)<!-- rules:end -->", readme, re.S)
    assert m, "README lacks the rules block"
    builtin = PluginHost.create()
    builtin.rules = {n: r for n, r in builtin.rules.items() if r.plugin in CATALOGUE}
    assert m.group(1) == rules_table(builtin, "markdown"), "README rule list is stale: regenerate it with `ctllint rules --format markdown`"


def test_every_hook_is_documented():
    specs = [f for name, f in inspect.getmembers(hookspecs, inspect.isfunction) if name.startswith("ctllint_")]
    assert len(specs) >= 4
    for f in specs:
        doc = inspect.getdoc(f)
        assert doc and len(doc) > 60, f.__name__


def test_plugins_import_only_the_public_api():
    allowed = {"ctllint", "ctllint.api", "ctllint.reading.model", "ctllint.reading.kinds", "ctllint.circuit.tables", "ctllint.reading.quantities", "ctllint.checking.hookspecs", "ctllint.testing", "ctllint.circuit.analysis", "ctllint.circuit.simulate", "ctllint.circuit.wiresets", "ctllint.reading.terminals"}
    seen = 0
    for folder, dirs, files in os.walk(os.path.join(ROOT, "plugins")):
        dirs[:] = [d for d in dirs if d not in ("__pycache__", "tests")]
        for name in files:
            if not name.endswith(".py"):
                continue
            with open(os.path.join(folder, name), encoding="utf-8") as handle:
                text = handle.read()
            for m in re.finditer(r"^\s*(?:from|import)\s+(ctllint(?!_plugins)[\w.]*)", text, re.M):
                seen += 1
                assert m.group(1) in allowed, f"{os.path.join(folder, name)} imports {m.group(1)}"
    assert seen > 20  # the walk reached the plugins' modules


def test_core_never_imports_plugins():
    for folder, _, files in os.walk(os.path.join(ROOT, "ctllint")):
        for name in files:
            if name.endswith(".py"):
                with open(os.path.join(folder, name), encoding="utf-8") as handle:
                    assert "ctllint_plugins" not in handle.read(), name


def test_lazy_command_table_matches_the_commands():
    from ctllint import commands
    from ctllint.commands.cli import COMMANDS

    commands.load()
    for name, (_, help_text) in commands.LAZY.items():
        assert COMMANDS[name][2] == help_text, name


def test_readme_device_kinds_are_current():
    from ctllint.output.schema import kinds_table

    with open(os.path.join(ROOT, "README.md"), encoding="utf-8") as handle:
        readme = handle.read()
    m = re.search(r"<!-- kinds:start -->\n(.*?)<!-- kinds:end -->", readme, re.S)
    assert m and m.group(1) == kinds_table(), "README device kinds are stale: regenerate with ctllint.output.schema.kinds_table()"


def test_readme_tour_example_is_clean():
    """The format tour in the README is a real schematic that obeys every rule."""
    from ctllint.testing import check_text

    with open(os.path.join(ROOT, "README.md"), encoding="utf-8") as handle:
        readme = handle.read()
    tour = readme.split("## A short tour of the format", 1)[1]
    example = re.search(r"```yaml\n(.*?)```", tour, re.S).group(1)
    assert check_text(example, "tour.ctl.yaml") == []
