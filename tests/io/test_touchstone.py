"""Checks of the Touchstone one-port reader and writer (the demo sweep is checked against its
script in tests/cli/test_demo_stations.py).

Independent references: files written by scikit-rf (``Network.write_touchstone``) from known
impedances; hand-written files whose expected impedance is worked out by hand in the comment
beside each case, from the definitions of the Touchstone File Format Specification 2.0 (IBIS
Open Forum, 2009) and rho = (Z - R)/(Z + R) (Pozar, Microwave Engineering, 4th ed.,
section 2.3).
"""
from __future__ import annotations

import os
import subprocess
import sys

import numpy as np
import pytest

from linecalc.io.touchstone import (
    TouchstoneError,
    TouchstoneWriteError,
    read_one_port,
    write_one_port,
)

skrf = pytest.importorskip("skrf")

FREQUENCY_HZ = np.array([1.85e6, 7.1e6, 14.2e6, 29.7e6, 144.2e6])
Z_OHM = np.array([30 + 40j, 73 - 12j, 1200 + 900j, 4 - 60j, 52 + 3j])
UNITS = {"hz": 1.0, "khz": 1e3, "mhz": 1e6, "ghz": 1e9}


# --- files written by scikit-rf --------------------------------------------------------------

@pytest.mark.parametrize("unit", list(UNITS))
@pytest.mark.parametrize("form", ["ri", "ma", "db"])
@pytest.mark.parametrize("reference_ohm", [50.0, 75.0])
@pytest.mark.parametrize("parameter, version", [("S", "1.0"), ("Z", "1.0"), ("S", "2.0"), ("Z", "2.0"),
                                                ("Y", "2.0")])
def test_reads_files_written_by_scikit_rf(tmp_path, unit, form, reference_ohm, parameter, version):
    frequency = skrf.Frequency.from_f(FREQUENCY_HZ / UNITS[unit], unit=unit)
    network = skrf.Network.from_z(Z_OHM.reshape(-1, 1, 1), frequency=frequency, z0=reference_ohm)
    network.name = "sweep"
    network.write_touchstone("sweep", dir=tmp_path, form=form, parameter=parameter, version=version)
    (path,) = tmp_path.iterdir()
    frequency_hz, z_ohm = read_one_port(path)
    # scikit-rf writes full-precision decimal text; the DB and MA forms cost a few ulps
    np.testing.assert_allclose(frequency_hz, FREQUENCY_HZ, rtol=1e-12)
    np.testing.assert_allclose(z_ohm, Z_OHM, rtol=1e-9)


# --- hand-written files ----------------------------------------------------------------------

# Each case: file name, text, expected Z at its one frequency (7.1 MHz) [ohm]. The reference
# point: Z = 30 + j40 against R = 50 has rho = (Z - R)/(Z + R) = (-20 + j40)/(80 + j40) = j0.5,
# that is 0.5 at 90 degrees, or -6.0206 dB (20 log10 0.5); against R = 75, rho = j0.5 means
# Z = 75 (1 + j0.5)/(1 - j0.5) = 45 + j60.
HAND_WRITTEN = {
    "comments_and_blank_lines": ("a.s1p", ("! analyser export\n\n!  another comment\n# MHz S MA R 50 ! trailing\n"
                                           "\n7.1 0.5 90 ! at resonance\n! end\n"), 30 + 40j),
    "lower_case_option_line": ("a.s1p", "# mhz s ma r 50\n7.1 0.5 90\n", 30 + 40j),
    "reference_75": ("a.s1p", "# MHz S MA R 75\n7.1 0.5 90\n", 45 + 60j),
    "hz_ri": ("a.s1p", "# Hz S RI R 50\n7100000 0 0.5\n", 30 + 40j),
    "khz_db": ("a.s1p", "# kHz S DB R 50\n7100 -6.020599913279624 90\n", 30 + 40j),
    "ghz_ri": ("a.s1p", "# GHz S RI R 50\n0.0071 0.0 0.5\n", 30 + 40j),
    # no option line: the defaults are GHz, S, MA, R 50 (specification, option line)
    "default_option_line": ("a.s1p", "0.0071 0.5 90\n", 30 + 40j),
    # 1.x Z data are normalised to R: z = Z/R = 0.6 + j0.8 for 30 + j40 at 50, 45 + j60 at 75
    "z_v1": ("a.s1p", "# MHz Z RI R 50\n7.1 0.6 0.8\n", 30 + 40j),
    "z_v1_reference_75": ("a.z1p", "# MHz Z MA R 75\n7.1 1.0 53.13010235415598\n", 45 + 60j),
    # 1.x Y data: normalised admittance y = Y R (Pozar, section 2.4, y = Y Z0): Y = 1/(30 + j40)
    # = 0.012 - j0.016 S, so y = 0.6 - j0.8 at R = 50; at R = 1 the number is Y itself.
    "y_v1": ("a.y1p", "# MHz Y RI R 50\n7.1 0.6 -0.8\n", 30 + 40j),
    "y_v1_reference_1": ("a.s1p", "# MHz Y RI R 1\n7.1 0.012 -0.016\n", 30 + 40j),
    # 2.x keywords; [Reference] on its own line overrides the option line's R; data not normalised
    "s_v2_reference_keyword": ("a.ts", ("! version 2 file\n[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n"
                                        "[Number of Frequencies] 1\n[Reference]\n75\n[Network Data]\n7.1 0 0.5\n"
                                        "[End]\n"), 45 + 60j),
    "z_v2": ("a.ts", ("[Version] 2.0\n# MHz Z RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
                      "[Network Data]\n7.1 30 40 ! ohm, not normalised\n[End]\n"), 30 + 40j),
    "y_v2": ("a.ts", ("[Version] 2.0\n# MHz Y RI R 75\n[Number of Ports] 1\n[Number of Frequencies] 1\n"
                      "[Network Data]\n7.1 0.012 -0.016\n[End]\n"), 30 + 40j),
}


@pytest.mark.parametrize("case", list(HAND_WRITTEN))
def test_reads_hand_written_files(case, write_file):
    name, text, expected = HAND_WRITTEN[case]
    frequency_hz, z_ohm = read_one_port(write_file(name, text))
    np.testing.assert_allclose(frequency_hz, [7.1e6], rtol=1e-15)
    np.testing.assert_allclose(z_ohm, [expected], rtol=1e-12)


def test_scikit_rf_agrees_on_the_hand_written_s_z_and_v2_files(tmp_path):
    # scikit-rf's own conversion to Z, on every case except 1.x Y data with R other than 1
    # (scikit-rf 2.2 multiplies those by R where the normalised admittance y = Y R asks to divide).
    for case, (name, text, _) in HAND_WRITTEN.items():
        if case == "y_v1":
            continue
        folder = tmp_path / case
        folder.mkdir()
        path = folder / name
        path.write_text(text)
        np.testing.assert_allclose(read_one_port(path)[1], skrf.Network(str(path)).z[:, 0, 0], rtol=1e-12)


def test_an_open_reads_as_infinite_impedance(write_file):
    _, z_ohm = read_one_port(write_file("open.s1p", "# MHz S RI R 50\n7.0 1 0\n7.1 -1 0\n"))
    assert np.isinf(z_ohm[0]) and z_ohm[1] == 0


# --- bad files -------------------------------------------------------------------------------

def _two_port_file(tmp_path):
    frequency = skrf.Frequency.from_f([7.0, 7.1], unit="mhz")
    network = skrf.Network(frequency=frequency, s=np.full((2, 2, 2), 0.1 + 0j), z0=50, name="pad")
    network.write_touchstone("pad", dir=tmp_path)
    return tmp_path / "pad.s2p"


BAD_FILES = {
    # name: (file name, text, line expected in the error, words expected in the message)
    "empty": ("a.s1p", "", 1, "empty"),
    "comments_only": ("a.s1p", "! nothing here\n!\n", 1, "empty"),
    "no_data_rows": ("a.s1p", "! header\n# MHz S RI R 50\n", 2, "no data"),
    "truncated_row": ("a.s1p", "# MHz S RI R 50\n7.0 0.1 0.2\n7.1 0.1\n", 3, "truncated"),
    "non_numeric": ("a.s1p", "# MHz S RI R 50\n7.0 0.1 0.2\n7.1 0.1 O.2\n", 3, "field 3 is not a number"),
    "not_finite": ("a.s1p", "# MHz S RI R 50\n7.0 0.1 nan\n", 2, "not a finite number"),
    "two_port_rows_in_s1p": ("a.s1p", "# MHz S RI R 50\n! two-port data\n7.0 0.1 0 0.9 0 0.9 0 0.1 0\n", 3,
                             "8 values after the frequency"),
    "two_port_keyword": ("a.ts", ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 2\n[Network Data]\n"
                                  "7.0 0.1 0 0.9 0 0.9 0 0.1 0\n[End]\n"), 3, "one-port file is needed"),
    "frequencies_decrease": ("a.s1p", "# MHz S RI R 50\n7.0 0.1 0\n7.2 0.1 0\n7.1 0.1 0\n", 4,
                             "7.1 follows 7.2 (line 3)"),
    "frequency_repeated": ("a.s1p", "# MHz S RI R 50\n7.0 0.1 0\n7.0 0.2 0\n", 3, "must increase"),
    "frequency_zero": ("a.s1p", "# MHz S RI R 50\n0 0.1 0\n", 2, "above zero"),
    "v2_fewer_rows_than_declared": ("a.ts", ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n"
                                             "[Number of Frequencies] 3\n[Network Data]\n7.0 0.1 0\n7.1 0.1 0\n"
                                             "[End]\n"), 7, "3 but the file has 2"),
    "v2_without_end": ("a.ts", ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Network Data]\n"
                                "7.0 0.1 0\n7.1 0.1 0\n"), 6, "no [End]"),
    "g_parameters": ("a.s1p", "! header\n# MHz G RI R 50\n7.0 0.1 0\n", 2, "field 2 is not a parameter"),
    "bad_unit": ("a.s1p", "# MHZZ S RI R 50\n7.0 0.1 0\n", 1, "not a frequency unit"),
    "negative_reference": ("a.s1p", "# MHz S RI R -50\n7.0 0.1 0\n", 1, "one positive resistance"),
    "unknown_name_without_version": ("a.txt", "# MHz S RI R 50\n7.0 0.1 0\n", 1, "not a Touchstone one-port"),
    # the station file's limits hold in a sweep too (README, Errors and exit status)
    "frequency_beyond_1_thz": ("a.s1p", "# Hz S RI R 50\n7e6 0.1 0\n1e13 0.1 0\n", 3, "at most 1e+12 Hz"),
    "frequency_beyond_1_thz_in_ghz": ("a.s1p", "# GHz S RI R 50\n1001 0.1 0\n", 2, "at most 1e+12 Hz"),
    "reference_1e300": ("a.s1p", "# MHz S RI R 1e300\n7.0 0.1 0\n", 1, "at most 1e+09 ohm"),
    "v2_reference_not_a_number": ("a.ts", ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Reference] abc\n"
                                           "[Network Data]\n7.0 0.1 0\n[End]\n"), 4, "[Reference]: field 1 is not a number"),
    "v2_reference_1e300": ("a.ts", ("[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Reference] 1e300\n"
                                    "[Network Data]\n7.0 0.1 0\n[End]\n"), 4, "at most 1e+09 ohm"),
    "option_line_after_data": ("a.s1p", "7.0 0.1 0\n# MHz S RI R 50\n7.1 0.1 0\n", 2, "an option line after the data"),
    "negative_ma_magnitude": ("a.s1p", "# MHz S MA R 50\n7.0 -0.5 30\n", 2, "magnitude (MA format) is 0 or more"),
    "negative_magnitude_default_format": ("a.s1p", "# MHz S\n7.0 -0.5 30\n", 2, "magnitude (MA format)"),
    "version_3": ("a.ts", "[Version] 3.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Network Data]\n7.0 0.1 0\n[End]\n",
                  1, "[Version] is not 2.0 or 2.1: linecalc reads Touchstone 1.x files and 2.0 or 2.1 files"),
}


@pytest.mark.parametrize("case", list(BAD_FILES))
def test_bad_files_name_file_and_line(case, write_file):
    name, text, line, words = BAD_FILES[case]
    path = write_file(name, text)
    with pytest.raises(TouchstoneError) as info:
        read_one_port(path)
    assert info.value.file == str(path)
    assert info.value.line == line
    assert words in info.value.message
    assert str(info.value).startswith(f"{path}:{line}: ")


def test_a_two_port_file_is_refused(tmp_path):
    path = _two_port_file(tmp_path)
    with pytest.raises(TouchstoneError) as info:
        read_one_port(path)
    assert info.value.line == 1 and "2-port file" in info.value.message


@pytest.mark.parametrize("kind", ["missing", "folder"])
def test_a_file_that_cannot_be_opened_names_the_file(tmp_path, kind):
    path = tmp_path / "sweep.s1p"
    if kind == "folder":
        path.mkdir()
    with pytest.raises(TouchstoneError) as info:
        read_one_port(path)
    assert info.value.file == str(path) and info.value.line is None
    assert str(info.value).startswith(f"{path}: ")


def test_without_scikit_rf_the_error_says_so(monkeypatch, write_file):
    path = write_file("a.s1p", "! header\n# MHz S RI R 50\n7.0 0.1 0\n")
    monkeypatch.setitem(sys.modules, "skrf", None)
    monkeypatch.setitem(sys.modules, "skrf.io", None)
    monkeypatch.setitem(sys.modules, "skrf.io.touchstone", None)
    with pytest.raises(TouchstoneError, match="needs scikit-rf") as info:
        read_one_port(path)
    assert info.value.line == 2


def test_modules_do_not_import_scikit_rf():
    # the plain budget must not pay scikit-rf's import cost
    code = ("import sys, linecalc.io.touchstone, linecalc.physics.deembed, linecalc.physics.swr_curve; "
            "print('skrf' in sys.modules)")
    result = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert result.stdout.strip() == "False"


# --- writing ---------------------------------------------------------------------------------

def test_write_reads_back_exactly_and_scikit_rf_agrees(tmp_path):
    z = np.append(Z_OHM[:-1], complex(np.inf, 0))  # an open, written as S = 1
    path = write_one_port(tmp_path / "out.s1p", FREQUENCY_HZ, z, 75.0, comment="line one\nline two")
    frequency_hz, z_ohm = read_one_port(path)
    np.testing.assert_array_equal(frequency_hz, FREQUENCY_HZ)
    np.testing.assert_allclose(z_ohm[:-1], z[:-1], rtol=1e-14)
    assert np.isinf(z_ohm[-1])
    network = skrf.Network(str(path))
    np.testing.assert_allclose(network.z[:-1, 0, 0], z[:-1], rtol=1e-12)
    assert network.z0[0, 0] == 75.0
    text = path.read_text()
    assert text.startswith("! line one\n! line two\n# Hz S RI R 75\n")


def test_write_refuses_an_existing_output_without_force(tmp_path):
    path = tmp_path / "out.s1p"
    path.write_text("keep me\n")
    with pytest.raises(TouchstoneWriteError, match="--force"):
        write_one_port(path, FREQUENCY_HZ, Z_OHM)
    assert path.read_text() == "keep me\n"
    write_one_port(path, FREQUENCY_HZ, Z_OHM, force=True)
    np.testing.assert_allclose(read_one_port(path)[1], Z_OHM, rtol=1e-14)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out.s1p"]  # no temporary file left


def test_write_never_replaces_a_protected_input(tmp_path, write_file):
    source = write_file("measured.s1p", "# MHz S RI R 50\n7.0 0.1 0\n")
    for target in (source, tmp_path / "." / "measured.s1p"):
        with pytest.raises(TouchstoneWriteError, match="input"):
            write_one_port(target, FREQUENCY_HZ, Z_OHM, force=True, protected=[source])
    assert source.read_text() == "# MHz S RI R 50\n7.0 0.1 0\n"
    link = tmp_path / "alias.s1p"
    link.symlink_to(source)
    with pytest.raises(TouchstoneWriteError, match="input"):
        write_one_port(link, FREQUENCY_HZ, Z_OHM, force=True, protected=[source])


@pytest.mark.skipif(os.name != "posix" or os.geteuid() == 0, reason="root ignores folder permissions")
def test_write_into_a_read_only_folder_is_a_write_error(tmp_path):
    folder = tmp_path / "locked"
    folder.mkdir()
    folder.chmod(0o500)
    try:
        with pytest.raises(TouchstoneWriteError, match="cannot be written"):
            write_one_port(folder / "out.s1p", FREQUENCY_HZ, Z_OHM)
    finally:
        folder.chmod(0o700)


def test_write_into_a_missing_folder_is_a_write_error(tmp_path):
    with pytest.raises(TouchstoneWriteError, match="cannot be written") as info:
        write_one_port(tmp_path / "no-such-folder" / "out.s1p", FREQUENCY_HZ, Z_OHM)
    assert info.value.file == str(tmp_path / "no-such-folder" / "out.s1p")


def test_write_rejects_bad_arrays(tmp_path):
    with pytest.raises(ValueError, match="increasing"):
        write_one_port(tmp_path / "a.s1p", FREQUENCY_HZ[::-1], Z_OHM)
    with pytest.raises(ValueError, match="NaN"):
        write_one_port(tmp_path / "a.s1p", FREQUENCY_HZ, np.full(FREQUENCY_HZ.shape, np.nan + 0j))
    with pytest.raises(ValueError, match="infinite"):
        write_one_port(tmp_path / "a.s1p", FREQUENCY_HZ, np.full(FREQUENCY_HZ.shape, -50 + 0j))
    assert not list(tmp_path.iterdir())
