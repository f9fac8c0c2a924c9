"""Outputs never destroy anything: --force replaces only a regular file (or a symlink to one), no
writer replaces an input (by path or by file), a write the system refuses exits 2 naming the file,
a refused write prints nothing, and SIGTERM, SIGHUP and Ctrl-C end the command in one line with
no temporary file left. Every case runs in-process: no process is started."""
from __future__ import annotations

import os
import signal
import stat

import pytest

from linecalc import cli as cli_module
from linecalc.io import atomic


@pytest.fixture
def sweep_station(tmp_path, data_path):
    """A copy of the shack-sweep station in ``tmp_path`` whose touchstone: names ``target``."""
    text = data_path("shack-sweep-dipole.yaml").read_text()

    def make(target, name="station.yaml"):
        path = tmp_path / name
        path.write_text(text.replace("demo-shack-sweep.s1p", str(target)))
        return path

    return make


def leftovers(folder):
    return sorted(p.name for p in folder.iterdir() if p.name.startswith(".") and p.name.endswith(".tmp"))


def test_force_never_replaces_a_fifo_nor_a_symlink_to_one(cli, tmp_path, data_path):
    fifo = tmp_path / "pipe.png"
    os.mkfifo(fifo)
    link = tmp_path / "link.svg"
    link.symlink_to(fifo)
    for target in (fifo, link):
        code, out, err = cli("plot", data_path("hilltop-dipole.yaml"), "swr", target, "--force")
        assert code == 2 and out == ""
        assert err == f"linecalc plot: {target} is a FIFO (named pipe), not a regular file; it is never replaced\n"
    assert stat.S_ISFIFO(os.stat(fifo).st_mode) and link.is_symlink()
    assert leftovers(tmp_path) == []


@pytest.mark.skipif(os.geteuid() != 0, reason="making a device node needs root")
def test_force_never_replaces_a_device(cli, tmp_path, sweep_station, data_path):
    (tmp_path / "demo-shack-sweep.s1p").write_bytes(data_path("demo-shack-sweep.s1p").read_bytes())
    device = tmp_path / "null.s1p"
    os.mknod(device, 0o666 | stat.S_IFCHR, os.makedev(1, 3))  # the null device's numbers on Linux, from memory
    code, out, err = cli("feedpoint", sweep_station("demo-shack-sweep.s1p"), "--output", device, "--force")
    assert code == 2 and out == ""
    assert "is a character device, not a regular file; it is never replaced" in err
    assert stat.S_ISCHR(os.stat(device).st_mode)


def test_force_replaces_a_regular_file_and_a_symlink_to_one(cli, tmp_path, data_path):
    old = tmp_path / "old.png"
    old.write_bytes(b"old")
    link = tmp_path / "link.png"
    link.symlink_to(old)
    for target in (old, link):
        code, _, err = cli("plot", data_path("hilltop-dipole.yaml"), "swr", target, "--force")
        assert code == 0, err
    assert old.read_bytes().startswith(b"\x89PNG") and not link.is_symlink()  # the link itself replaced


@pytest.mark.parametrize("output", ["station.svg", "station.png", "hard.svg"])
def test_plot_never_replaces_its_station_by_path_or_by_file(cli, tmp_path, data_path, output):
    station = tmp_path / "station.svg"
    station.write_text(data_path("hilltop-dipole.yaml").read_text())
    if output == "station.png":
        (tmp_path / output).symlink_to(station)
    if output == "hard.svg":
        os.link(station, tmp_path / output)
    before = station.read_bytes()
    code, out, err = cli("plot", station, "swr", tmp_path / output, "--force")
    assert code == 2 and out == "" and "is an input of this run" in err, err
    assert station.read_bytes() == before


def test_no_writer_replaces_the_sweep_a_station_reads(cli, tmp_path, sweep_station, data_path):
    sweep = tmp_path / "sweep.s1p"
    sweep.write_bytes(data_path("demo-shack-sweep.s1p").read_bytes())
    station = sweep_station("sweep.s1p")
    link = tmp_path / "sweep-link.png"
    link.symlink_to(sweep)
    before = sweep.read_bytes()
    for args in (["feedpoint", station, "--output", sweep, "--force"], ["plot", station, "swr", link, "--force"],
                 ["budget", station, "--radio-s1p", link, "--force"]):
        code, out, err = cli(*args)
        assert code == 2 and out == "" and "is an input of this run" in err, err
    assert sweep.read_bytes() == before and link.is_symlink()


def test_a_sweep_named_by_a_bare_number_is_an_input(tmp_path, sweep_station):
    from linecalc.io.station_file import input_files

    station = sweep_station("123")  # touchstone: 123, which YAML reads as a number
    assert input_files(station) == [station, tmp_path / "123"]


def test_a_refused_feedpoint_output_prints_nothing(cli, tmp_path, sweep_station, data_path):
    (tmp_path / "demo-shack-sweep.s1p").write_bytes(data_path("demo-shack-sweep.s1p").read_bytes())
    station = sweep_station("demo-shack-sweep.s1p")
    (tmp_path / "out.s1p").write_text("keep")
    code, out, err = cli("feedpoint", station, "--output", tmp_path / "out.s1p")
    assert code == 2 and out == "" and "exists" in err
    code, out, err = cli("feedpoint", station, "--output", "")
    assert code == 2 and out == "" and "needs a file name" in err


@pytest.mark.parametrize("make_target, reason", [
    (lambda d: d / "folder.png", "is a folder"),
    (lambda d: d / "plain" / "x.png", "Not a directory"),
    (lambda d: d / ("a" * 300 + ".png"), "File name too long"),
    (lambda d: d / "missing" / "x.png", "No such file or directory"),
])
def test_a_write_the_system_refuses_exits_2_naming_the_file(cli, tmp_path, data_path, make_target, reason):
    (tmp_path / "folder.png").mkdir()
    (tmp_path / "plain").write_text("a file, not a folder")
    target = make_target(tmp_path)
    code, out, err = cli("plot", data_path("hilltop-dipole.yaml"), "swr", target, "--force")
    assert code == 2 and out == "" and reason in err and err.count("\n") == 1, err
    assert leftovers(tmp_path) == []


@pytest.mark.skipif(os.geteuid() == 0, reason="root writes into a read-only folder")
def test_a_read_only_folder_exits_2(cli, tmp_path, data_path):
    folder = tmp_path / "ro"
    folder.mkdir()
    folder.chmod(0o555)
    try:
        code, out, err = cli("plot", data_path("hilltop-dipole.yaml"), "swr", folder / "x.png")
    finally:
        folder.chmod(0o755)
    assert code == 2 and out == "" and "Permission denied" in err


def test_a_250_character_output_name_works(cli, tmp_path, data_path):
    target = tmp_path / ("b" * 246 + ".png")  # 250 characters, under the usual limit of 255
    code, _, err = cli("plot", data_path("hilltop-dipole.yaml"), "swr", target)
    assert code == 0, err
    assert target.read_bytes().startswith(b"\x89PNG")


@pytest.mark.parametrize("signum", [signal.SIGTERM, signal.SIGHUP])
def test_a_signal_while_writing_leaves_no_temporary_file(tmp_path, signum):
    def write(out):
        out.write("half")
        signal.raise_signal(signum)  # the handler raises here, in the middle of the write

    with pytest.raises(cli_module._Terminated):
        with cli_module._signals_raise():
            atomic.write_atomically(tmp_path / "out.txt", write)
    assert list(tmp_path.iterdir()) == []


@pytest.mark.parametrize("raised, code, line", [
    (KeyboardInterrupt, 130, "linecalc: interrupted\n"),
    (lambda: signal.raise_signal(signal.SIGTERM), 128 + signal.SIGTERM, "linecalc: stopped by SIGTERM\n"),
    (lambda: signal.raise_signal(signal.SIGHUP), 128 + signal.SIGHUP, "linecalc: stopped by SIGHUP\n"),
])
def test_interrupts_end_in_one_line(cli, monkeypatch, raised, code, line):
    from linecalc import api

    def stop():
        raise KeyboardInterrupt

    monkeypatch.setattr(api, "list_cables", stop if raised is KeyboardInterrupt else raised)
    status, out, err = cli("cables")
    assert (status, out, err) == (code, "", line)
    assert signal.getsignal(signal.SIGTERM) is not cli_module._terminate  # handlers restored


def test_an_internal_error_in_a_batch_names_its_station_and_the_others_print(cli, tmp_path, data_path, monkeypatch):
    from linecalc import api

    for name in ("a.yaml", "b.yaml"):
        (tmp_path / name).write_text(data_path("hilltop-dipole.yaml").read_text())
    solve = api.solve_budget

    def faulty(station, **kwargs):
        if station.source_file.endswith("a.yaml"):
            raise ZeroDivisionError("a fault of linecalc's")
        return solve(station, **kwargs)

    monkeypatch.setattr(api, "solve_budget", faulty)
    code, out, err = cli("budget", tmp_path)
    assert code == 1
    assert err.splitlines()[0] == f"{tmp_path / 'a.yaml'}: internal error: ZeroDivisionError: a fault of linecalc's"
    assert out.strip()  # b.yaml printed
