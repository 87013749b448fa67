"""Property-based fuzzing of the part-file reader: random and malformed TOML, hostile values, mutated
examples. The only outcomes allowed are a PartSpec that satisfies the reader's promises, or PartError with
one line that names a key (or the file) and says what is allowed. Anything else (another exception, a
traceback, a case that runs for long) fails the test.

The examples are derandomised so that CI runs the same cases every time; see tests/fuzzparts.py for the
strategies. Time per case is bounded by `within` (a hang fails instead of stalling CI).
"""

from __future__ import annotations

import dataclasses
import math
import re
import signal
from contextlib import contextmanager

import pytest
from hypothesis import HealthCheck, given, settings

from fuzzparts import core_parts, mutated_examples, raw_texts, toml_text
from stressraiser.geometry.errors import PartError
from stressraiser.geometry.partfile import parse_part
from stressraiser.geometry.registry import outline_bounds
from stressraiser.geometry.spec import PartSpec

CASE_SECONDS = 20  # far above the few milliseconds a case takes; only a hang reaches it
MESSAGE = re.compile(r"^[^\n]{1,200}?: \S[^\n]*$")  # "<key or file>: <what is wrong and what is allowed>"

FUZZ = settings(deadline=None, derandomize=True, database=None,
                suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large, HealthCheck.filter_too_much])


class Hang(Exception):
    """A case ran past CASE_SECONDS."""


@contextmanager
def within(seconds: float):
    """Fail with Hang if the block runs longer than `seconds` (SIGALRM; main thread only)."""
    def alarm(signum, frame):
        raise Hang(f"a case ran longer than {seconds} s")

    previous = signal.signal(signal.SIGALRM, alarm)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)


def read(text: str) -> PartSpec | str:
    """The PartSpec, or the PartError message (checked to be one line naming a key)."""
    with within(CASE_SECONDS):
        try:
            spec = parse_part(text)
        except PartError as exc:
            message = str(exc)
            assert MESSAGE.match(message), f"not one clear line: {message!r}"
            return message
    assert isinstance(spec, PartSpec)
    _check_promises(spec)
    return spec


def _check_promises(spec: PartSpec) -> None:
    """What an accepted part guarantees, checked independently of the reader's own code: every number
    finite, plate dimensions and the modulus positive, every hole strictly inside the plate."""
    for value in _numbers(spec):
        assert math.isfinite(value), spec
    p = spec.plate
    assert p.length > 0 and p.width > 0 and p.thickness > 0 and spec.material.E > 0
    assert -1.0 < spec.material.nu < 0.5
    x0, y0, x1, y1 = outline_bounds(spec)  # the bar centred on the origin; a drawn outline where it is drawn
    assert x1 - x0 == pytest.approx(p.length) and y1 - y0 == pytest.approx(p.width)
    for h in spec.holes:
        assert h.diameter > 0
        assert x0 < h.center[0] - h.radius and h.center[0] + h.radius < x1
        assert y0 < h.center[1] - h.radius and h.center[1] + h.radius < y1


def _numbers(node):
    if dataclasses.is_dataclass(node):
        for f in dataclasses.fields(node):
            yield from _numbers(getattr(node, f.name))
    elif isinstance(node, (tuple, list)):
        for item in node:
            yield from _numbers(item)
    elif isinstance(node, float):
        yield node


@settings(FUZZ, max_examples=150)
@given(raw_texts)
def test_random_and_garbled_text(text):
    read(text)


def _run_counting(strategy, examples: int) -> dict[str, int]:
    """Read `examples` generated part dictionaries; count the accepted and the refused ones."""
    outcomes = {"valid": 0, "refused": 0}

    @settings(FUZZ, max_examples=examples)
    @given(strategy)
    def case(data):
        outcomes["valid" if isinstance(read(toml_text(data)), PartSpec) else "refused"] += 1

    case()
    return outcomes


def test_sloppy_core_parts():
    outcomes = _run_counting(core_parts(), 220)
    # the generator must reach both outcomes, or the test says little
    assert outcomes["valid"] >= 5 and outcomes["refused"] >= 50, outcomes


def test_mutated_examples():
    outcomes = _run_counting(mutated_examples(), 220)
    assert outcomes["valid"] >= 5 and outcomes["refused"] >= 50, outcomes
