"""A catch block skips a record only for the exceptions it really catches (the class hierarchy of
the Java SE API docs: ArrayIndexOutOfBoundsException extends IndexOutOfBoundsException extends
RuntimeException; NumberFormatException extends IllegalArgumentException; ParseException is a
checked Exception). A record that throws something not caught fails the Hadoop job, so the script
must fail too, never skip it."""
from __future__ import annotations

from migrate.lift.exprs import Scope


def _scope(*caught: str) -> Scope:
    return Scope({}, caught=frozenset(caught))


def test_catching_illegal_argument_skips_bad_numbers_but_not_bad_indexes():
    s = _scope("IllegalArgumentException")
    assert s.on_error("parse_int") == "null"
    assert s.on_error("index") == "fail"
    assert s.on_error("token_at") == "fail"


def test_catching_runtime_exception_does_not_catch_a_checked_parse_exception():
    s = _scope("RuntimeException")
    assert s.on_error("index") == "null" and s.on_error("token_at") == "null"
    assert s.on_error("date_parse") == "fail"
    assert _scope("Exception").on_error("date_parse") == "null"


def test_index_out_of_bounds_catches_both_index_errors():
    s = _scope("IndexOutOfBoundsException")
    assert s.on_error("index") == "null" and s.on_error("char_at") == "null"
    assert s.on_error("parse_int") == "fail"
