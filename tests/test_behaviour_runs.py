"""The behaviour plugin's two rules read one run of each scenario: it is simulated once per file, not once per rule.

``expectation`` and ``unsettled`` live in modules of their own; the runs they
share are kept in one place (``ctllint_plugins.behaviour._scenario_runs``).
Were each rule to keep its own, every scenario would be simulated twice.
"""
from collections import Counter

from ctllint.checking.engine import Checker
from ctllint.circuit.simulate import Simulator

# Two scenarios: the first fails its check (no seal-in, so M1 drops out when
# PB2 is released), the second never settles (CR1 opens its own coil), so
# each of the two rules has a finding and has read the runs.
TEXT = """ctllint: 1
supplies:
  ctl: {hot: L1, common: X2, voltage: 120 VAC}
devices:
  PB1: {kind: pushbutton, function: stop}
  PB2: {kind: pushbutton, function: start}
  PB3: {kind: pushbutton, function: start}
  M1: {kind: contactor, coil: 120 VAC}
  CR1: {kind: relay, coil: 120 VAC}
rungs:
  - paths:
      - [L1, PB1.NC, 1, PB2.NO, 2, M1.coil, X2]
  - paths:
      - [L1, PB3.NO, 3, CR1.NC, 4, CR1.coil, X2]
expect:
  - name: start latches
    steps:
      - press: PB2
      - release: PB2
      - check: {M1: on}
  - name: pulse
    steps:
      - press: PB3
"""


def test_each_scenario_is_simulated_once_for_both_rules(monkeypatch):
    runs = Counter()
    original = Simulator.run_scenario

    def counted(self, scenario):
        runs[scenario.name] += 1
        return original(self, scenario)

    monkeypatch.setattr(Simulator, "run_scenario", counted)
    result = Checker.default(select=["expectation", "unsettled"]).check_text(TEXT)
    rules = Counter(d.rule for d in result.diagnostics)
    assert rules == {"expectation": 1, "unsettled": 1}, result.diagnostics
    assert runs == {"start latches": 1, "pulse": 1}
