"""The error types: messages pinned word for word, pickling, qualification, internal defects.

Source: the command line's contract in ``workbook/cli.py`` (exit 2 for bad input with one
line naming the field and what is allowed; exit 3 for a defect of the workbook) and the
message form ``<field>: got <given>; allowed: <allowed>`` that every panel and command prints.
"""

import pickle

import pytest

from workbook import cli
from workbook.design import DesignFileError
from workbook.errors import InputError, InternalDefect, ModelValidityError
from workbook.record.errors import RecordError


def test_the_message_is_field_given_allowed():
    assert str(InputError("bore", "-5 mm", "a length greater than 0 mm")) == \
        "bore: got -5 mm; allowed: a length greater than 0 mm"


@pytest.mark.parametrize("err", [
    InputError("bore", "-5 mm", "a length greater than 0 mm"),
    ModelValidityError("nu40", "1 cSt", "at least 2 cSt"),
    RecordError("lift.json, digest", "a changed record", "a record saved by the workbook"),
    DesignFileError.at("press.toml", 7, "axes.ram.cylinder.bore", "'80'", "a length with a unit"),
])
def test_every_error_type_survives_pickling(err):
    back = pickle.loads(pickle.dumps(err))
    assert type(back) is type(err) and str(back) == str(err)
    assert (back.field, back.given, back.allowed) == (err.field, err.given, err.allowed)
    if isinstance(err, DesignFileError):
        assert (back.file, back.line, back.key) == ("press.toml", 7, "axes.ram.cylinder.bore")


def test_qualified_keeps_the_type_and_renames_the_field():
    err = ModelValidityError("nu40", "1 cSt", "at least 2 cSt").qualified("axes.ram.oil.nu40")
    assert isinstance(err, ModelValidityError)
    assert str(err) == "axes.ram.oil.nu40: got 1 cSt; allowed: at least 2 cSt"


def test_a_long_given_is_echoed_as_an_excerpt_that_counts_every_character():
    err = InputError("bore", "8" * 5000, "a length")
    assert str(err).endswith("... (5000 characters); allowed: a length")
    # re-qualifying an excerpt does not cut it again
    assert "(5000 characters)" in str(err.qualified("axes.ram.cylinder.bore"))


def test_an_internal_defect_is_not_bad_input():
    assert not issubclass(InternalDefect, InputError)
    assert str(InternalDefect("result speed", "a value that is not finite")) == \
        "result speed: a value that is not finite (an internal defect of the workbook: please report it)"


def test_the_command_line_exits_3_on_an_internal_defect(monkeypatch, tmp_path, capsys):
    def broken(args):
        raise InternalDefect("result speed", "a value that is not finite")

    parser = cli.build_parser()
    args = parser.parse_args(["evaluate", str(tmp_path / "x.toml")])
    monkeypatch.setattr(cli, "build_parser", lambda: type("P", (), {"parse_args": lambda self, a: args})())
    args.run = broken
    assert cli.main([]) == cli.EXIT_DEFECT == 3
    assert "internal defect" in capsys.readouterr().err
