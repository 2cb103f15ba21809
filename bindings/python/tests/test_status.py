"""Status codes, their messages and the exception classes."""

from __future__ import annotations

import pickle

import pytest

import flatray
from flatray import Status

EXPECTED_CLASSES = {
    Status.NULL_POINTER: flatray.NullPointerError,
    Status.INVALID_ARGUMENT: flatray.InvalidArgumentError,
    Status.TOTAL_INTERNAL_REFLECTION: flatray.TotalInternalReflectionError,
    Status.MISSES_INTERFACE: flatray.MissesInterfaceError,
    Status.WRONG_SIDE: flatray.WrongSideError,
    Status.NOT_CONVERGED: flatray.NotConvergedError,
    Status.OUT_OF_RANGE: flatray.OutOfRangeError,
    Status.BUFFER_TOO_SMALL: flatray.BufferTooSmallError,
    Status.INTERNAL: flatray.InternalError,
    Status.DEGENERATE: flatray.DegenerateError,
}


def test_status_values_are_the_header_values():
    # include/flatray.h: FLATRAY_OK = 0 ... FLATRAY_ERR_DEGENERATE = 10.
    assert [int(s) for s in Status] == list(range(11))
    assert Status(3).c_name == "FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION"
    assert Status.OK.c_name == "FLATRAY_OK"
    assert int(flatray.Image.SAGITTAL) == 0 and int(flatray.Image.TANGENTIAL) == 1


def test_every_code_has_its_own_message():
    messages = [flatray.status_message(s) for s in Status]
    assert all(isinstance(m, str) and m for m in messages)
    assert len(set(messages)) == len(messages)
    assert flatray.status_message(Status.OK) == "success"
    assert "NULL" in flatray.status_message(Status.NULL_POINTER)
    assert "total internal reflection" in flatray.status_message(3)


@pytest.mark.parametrize("code", [11, 255, -1, -(2**31), 2**31 - 1])
def test_unknown_codes_have_a_message(code):
    raw = flatray.lib.flatray_status_message(code)
    assert raw is not None
    message = flatray.status_message(code)
    assert message == "unknown flatray status code"
    assert message not in {flatray.status_message(s) for s in Status}


@pytest.mark.parametrize("status", list(EXPECTED_CLASSES))
def test_each_status_raises_its_subclass(status):
    with pytest.raises(EXPECTED_CLASSES[status]) as info:
        flatray.check(int(status), "flatray_something")
    error = info.value
    assert isinstance(error, flatray.FlatrayError)
    assert error.status is status
    assert error.message == flatray.status_message(status)
    assert status.c_name in str(error) and "flatray_something" in str(error)
    again = pickle.loads(pickle.dumps(error))
    assert type(again) is type(error) and again.status == error.status
    assert str(again) == str(error)


def test_ok_raises_nothing_and_unknown_codes_raise_the_base_class():
    flatray.check(0, "flatray_something")
    with pytest.raises(flatray.FlatrayError) as info:
        flatray.check(42, "flatray_something")
    assert type(info.value) is flatray.FlatrayError
    assert info.value.status == 42
    assert info.value.message == "unknown flatray status code"


def test_batch_errors_name_the_element():
    with pytest.raises(flatray.WrongSideError, match="at element 7") as info:
        flatray.check(5, "flatray_true_positions", index=7)
    assert info.value.index == 7
