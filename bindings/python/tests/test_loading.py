"""Finding and loading the library, and the ctypes declarations against the header."""

from __future__ import annotations

import ctypes
import re

import pytest

import flatray
from flatray import _lib, _types
from conftest import HEADER


def test_library_version_matches_package():
    # The package checks this at import; here it is checked again explicitly.
    assert flatray.library_version() == flatray.__version__ == "0.1.0"


def test_version_mismatch_fails_clearly():
    with pytest.raises(flatray.LibraryLoadError, match=r"0\.2\.0.*0\.1\.0.*FLATRAY_LIBRARY"):
        _lib.check_version("0.2.0", "/somewhere/libflatray.so", expected="0.1.0")
    _lib.check_version("0.1.0", "/somewhere/libflatray.so", expected="0.1.0")  # no error


def test_environment_variable_overrides(tmp_path):
    fake = tmp_path / "libflatray-custom.so"
    fake.write_bytes(b"")
    assert _lib.find_library({"FLATRAY_LIBRARY": str(fake)}, package_dir=tmp_path) == str(fake.resolve())


def test_environment_variable_naming_nothing_is_an_error(tmp_path):
    missing = tmp_path / "nowhere" / "libflatray.so"
    with pytest.raises(flatray.LibraryLoadError, match="FLATRAY_LIBRARY"):
        _lib.find_library({"FLATRAY_LIBRARY": str(missing)})


def test_repository_release_before_debug(tmp_path):
    package_dir = tmp_path / "bindings" / "python" / "flatray"
    package_dir.mkdir(parents=True)
    name = _lib.library_file_names()[0]
    for profile in ("debug", "release"):
        (tmp_path / "target" / profile).mkdir(parents=True)
        (tmp_path / "target" / profile / name).write_bytes(b"")
    found = _lib.find_library({}, package_dir=package_dir)
    assert found == str(tmp_path / "target" / "release" / name)
    (tmp_path / "target" / "release" / name).unlink()
    found = _lib.find_library({}, package_dir=package_dir)
    assert found == str(tmp_path / "target" / "debug" / name)


def test_nothing_found_names_the_variable(tmp_path, monkeypatch):
    monkeypatch.setattr(ctypes.util, "find_library", lambda name: None)
    package_dir = tmp_path / "bindings" / "python" / "flatray"
    package_dir.mkdir(parents=True)
    with pytest.raises(flatray.LibraryLoadError, match="FLATRAY_LIBRARY"):
        _lib.find_library({}, package_dir=package_dir)


def test_system_loader_is_the_last_resort(tmp_path, monkeypatch):
    monkeypatch.setattr(ctypes.util, "find_library", lambda name: f"lib{name}.so.0")
    assert _lib.find_library({}, package_dir=tmp_path / "a" / "b" / "c") == "libflatray.so.0"


def test_loading_a_non_library_fails_clearly(tmp_path):
    junk = tmp_path / "libflatray.so"
    junk.write_bytes(b"not a shared library")
    with pytest.raises(flatray.LibraryLoadError, match="FLATRAY_LIBRARY"):
        _lib.load(str(junk))


# --- the declarations against include/flatray.h ---------------------------------

def _header_text():
    if not HEADER.is_file():
        pytest.skip(f"header not found at {HEADER}")
    text = HEADER.read_text()
    text = re.sub(r"/\*.*?\*/", "", text, flags=re.S)
    return re.sub(r"//[^\n]*", "", text)


_SCALARS = {
    "double": ctypes.c_double,
    "float": ctypes.c_float,
    "int32_t": ctypes.c_int32,
    "uint32_t": ctypes.c_uint32,
    "size_t": ctypes.c_size_t,
    "FlatrayStatus": ctypes.c_int32,
    "FlatrayVec3": _types.FlatrayVec3,
    "FlatrayRay": _types.FlatrayRay,
    "FlatrayStack": _types.FlatrayStack,
    "FlatrayFresnel": _types.FlatrayFresnel,
    "FlatrayPath": _types.FlatrayPath,
    "FlatrayLens": _types.FlatrayLens,
    "FlatrayCameraView": _types.FlatrayCameraView,
}


def _ctype(c_type: str):
    c_type = " ".join(c_type.replace("*", " * ").split())
    if c_type == "const char *":
        return ctypes.c_char_p
    base = c_type.replace("const ", "").strip()
    if base.endswith("*"):
        return ctypes.POINTER(_SCALARS[base[:-1].strip()])
    return _SCALARS[base]


def _header_functions():
    text = _header_text()
    found = {}
    for m in re.finditer(r"([A-Za-z_][\w \*]*?)\b(flatray_\w+)\s*\(([^)]*)\)\s*;", text):
        restype, name, params = m.group(1), m.group(2), m.group(3).strip()
        argtypes = []
        if params and params != "void":
            for p in params.split(","):
                p = " ".join(p.split())
                # An array parameter (`const double b[3]`) is a pointer in C.
                p = re.sub(r"^(.*?)(\w+)\[\d+\]$", r"\1*\2", p)
                declared = re.match(r"(.*?)(\w+)$", p)
                argtypes.append(_ctype(declared.group(1)))
        found[name] = (_ctype(restype.strip()), argtypes)
    return found


def test_every_header_function_is_declared_exactly():
    header = _header_functions()
    assert len(header) == 32 + 11 + 9 + 1  # core and media 32, survey 11, camera 9, lines_of_sight 1
    assert set(header) == set(_lib.PROTOTYPES)
    for name, (restype, argtypes) in header.items():
        function = getattr(flatray.lib, name)
        assert function.restype is restype, name
        assert list(function.argtypes) == argtypes, name


def test_structs_match_the_header():
    text = _header_text()
    structs = dict(re.findall(r"typedef struct (\w+) \{(.*?)\} \1;", text, flags=re.S))
    assert set(structs) == {"FlatrayVec3", "FlatrayRay", "FlatrayStack", "FlatrayFresnel",
                            "FlatrayPath", "FlatrayLens", "FlatrayCameraView"}
    for name, body in structs.items():
        fields = []
        for line in body.split(";"):
            line = " ".join(line.split())
            if not line:
                continue
            m = re.match(r"(\w+) (\w+)(?:\[(\w+)\])?$", line)
            assert m, line
            c_type = _SCALARS[m.group(1)]
            if m.group(3):
                assert m.group(3) == "FLATRAY_MAX_LAYERS"
                c_type = c_type * flatray.MAX_LAYERS
            fields.append((m.group(2), c_type))
        mirror = getattr(_types, name)._fields_
        assert [f for f, _ in mirror] == [f for f, _ in fields], name
        for (_, ours), (_, theirs) in zip(mirror, fields):
            assert ctypes.sizeof(ours) == ctypes.sizeof(theirs), name
            assert getattr(ours, "_type_", ours) == getattr(theirs, "_type_", theirs), name
    # Packed doubles: what lets numpy buffers stand in for arrays of these structs.
    assert ctypes.sizeof(flatray.FlatrayVec3) == 24
    assert ctypes.sizeof(flatray.FlatrayRay) == 48
    assert ctypes.sizeof(flatray.FlatrayStack) == 200


def test_enums_and_constants_match_the_header():
    text = _header_text()
    assert re.search(r"#define FLATRAY_MAX_LAYERS (\d+)", text).group(1) == str(flatray.MAX_LAYERS)
    assert re.search(r'#define FLATRAY_VERSION_STRING "([^"]+)"', text).group(1) == flatray.__version__
    status = {k: int(v) for k, v in re.findall(r"(FLATRAY_(?:OK|ERR_\w+)) = (\d+)", text)}
    assert status == {s.c_name: int(s) for s in flatray.Status}
    images = {k: int(v) for k, v in re.findall(r"FLATRAY_IMAGE_(\w+) = (\d+)", text)}
    assert images == {i.name: int(i) for i in flatray.Image}
    materials = {k: int(v) for k, v in re.findall(r"FLATRAY_MATERIAL_(\w+) = (\d+)", text)}
    assert materials == {m.name: int(m) for m in flatray.Material}
    footings = {k: int(v) for k, v in re.findall(r"FLATRAY_FOOTING_(\w+) = (\d+)", text)}
    assert footings == {f.name: int(f) for f in flatray.Footing}
    pressure = re.search(r"#define FLATRAY_STANDARD_PRESSURE_PA ([\d.]+)", text).group(1)
    assert float(pressure) == flatray.STANDARD_PRESSURE_PA
