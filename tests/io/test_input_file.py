"""Inputs are regular files of bounded size: station files, files of a folder batch, Touchstone sweeps.

A FIFO must be refused without waiting for a writer, a device without reading it, a file past
its limit before it is read; each with exit status 2 and one line naming the file and what it is.
Every case runs in-process (no process to end) and the peak memory of each refusal is measured.
"""
from __future__ import annotations

import os

import pytest

from linecalc.io import input_file
from linecalc.io.input_file import InputFileError, read_bytes

PEAK_LIMIT_BYTES = 500_000_000


@pytest.fixture
def sweep_station(tmp_path, data_path):
    """``sweep_station(target)``: a copy of the shack-sweep station whose touchstone: names ``target``."""
    text = data_path("shack-sweep-dipole.yaml").read_text()

    def make(target):
        path = tmp_path / "station.yaml"
        path.write_text(text.replace("demo-shack-sweep.s1p", str(target)))
        return path

    return make


def test_a_fifo_is_refused_without_waiting(tmp_path):
    fifo = tmp_path / "pipe.yaml"
    os.mkfifo(fifo)
    with pytest.raises(InputFileError, match="FIFO"):
        read_bytes(fifo, 100)  # no writer: a blocking open would never return


def test_a_file_past_its_limit_is_refused(tmp_path):
    big = tmp_path / "big.yaml"
    big.write_bytes(b"#" * 101)
    with pytest.raises(InputFileError, match="101 bytes, over the limit of 100"):
        read_bytes(big, 100)
    assert read_bytes(big, 101) == b"#" * 101


def test_a_station_fifo_exits_2_naming_it(with_peak_memory, cli, tmp_path, one_error_line):
    fifo = tmp_path / "pipe.yaml"
    os.mkfifo(fifo)
    (code, out, err), peak = with_peak_memory(cli, "budget", fifo)
    assert code == 2 and out == ""
    line, message = one_error_line(err, fifo)
    assert line == 0 and "is a FIFO (named pipe), not a regular file" in message
    assert peak < PEAK_LIMIT_BYTES


def test_a_fifo_in_a_batch_folder_is_reported_and_the_others_print(cli, tmp_path, data_path):
    (tmp_path / "a.yaml").write_text(data_path("hilltop-dipole.yaml").read_text())
    os.mkfifo(tmp_path / "b.yaml")
    code, out, err = cli("budget", tmp_path)
    assert code == 2
    assert "b.yaml:0: cannot read the station file: is a FIFO" in err
    assert out.strip()  # a.yaml printed


def test_a_huge_station_file_is_refused_before_it_is_read(with_peak_memory, cli, tmp_path, one_error_line):
    big = tmp_path / "big.yaml"
    with open(big, "wb") as out:  # sparse: no disk used
        out.truncate(input_file.MAX_STATION_BYTES + 1)
    (code, out, err), peak = with_peak_memory(cli, "budget", big)
    assert code == 2 and out == ""
    _, message = one_error_line(err, big)
    assert "over the limit of 1,000,000 bytes" in message
    assert peak < PEAK_LIMIT_BYTES


def test_a_non_utf8_station_names_line_and_column(cli, tmp_path, one_error_line):
    bad = tmp_path / "bad.yaml"
    bad.write_bytes(b"name: ok\nradio: {power: 5 W}\nantenna: caf\xe9\n")
    code, out, err = cli("budget", bad)
    assert code == 2 and out == ""
    line, message = one_error_line(err, bad)
    # line 3, column 13: counted by hand in the bytes above ("antenna: caf" is 12 characters)
    assert line == 3 and "byte 0xe9 at column 13 is not UTF-8" in message


@pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="no /dev/zero")
def test_a_touchstone_device_is_refused_without_reading_it(with_peak_memory, cli, sweep_station, one_error_line):
    station = sweep_station("/dev/zero")
    (code, out, err), peak = with_peak_memory(cli, "feedpoint", station)
    assert code == 2 and out == ""
    _, message = one_error_line(err, station)
    assert "/dev/zero: is a character device, not a regular file (at antenna.touchstone)" in message
    assert peak < PEAK_LIMIT_BYTES


def test_a_touchstone_fifo_is_refused(cli, tmp_path, sweep_station, one_error_line):
    os.mkfifo(tmp_path / "pipe.s1p")
    station = sweep_station("pipe.s1p")
    code, out, err = cli("feedpoint", station)
    assert code == 2 and out == ""
    _, message = one_error_line(err, station)
    assert "pipe.s1p: is a FIFO (named pipe), not a regular file" in message


def test_a_huge_touchstone_file_is_refused(with_peak_memory, cli, tmp_path, sweep_station, one_error_line):
    with open(tmp_path / "huge.s1p", "wb") as out:
        out.truncate(input_file.MAX_TOUCHSTONE_BYTES + 1)
    station = sweep_station("huge.s1p")
    (code, out, err), peak = with_peak_memory(cli, "feedpoint", station)
    assert code == 2 and out == ""
    _, message = one_error_line(err, station)
    assert "over the limit of 10,000,000 bytes" in message
    assert peak < PEAK_LIMIT_BYTES


def test_a_cr_only_touchstone_file_reads_as_its_lines(cli, tmp_path, sweep_station, data_path):
    lf = data_path("demo-shack-sweep.s1p").read_bytes()
    (tmp_path / "cr.s1p").write_bytes(lf.replace(b"\r\n", b"\n").replace(b"\n", b"\r"))
    _, expected, _ = cli("feedpoint", sweep_station(data_path("demo-shack-sweep.s1p")), "--format", "json")
    code, out, err = cli("feedpoint", sweep_station("cr.s1p"), "--format", "json")
    assert code == 0, err
    assert out.replace("cr.s1p", "X") == expected.replace(str(data_path("demo-shack-sweep.s1p")), "X")
