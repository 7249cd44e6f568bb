"""measure refuses hostile surface files before reading them whole (issue 14, item 7).

The cases are the attack's: a CSV field over csv's 131,072-character limit, a profile whose
x are all equal (ZeroDivisionError), a PLY face index out of range (IndexError), and a
sparse STL whose header claims 1e8 triangles (6.4 GB before being refused).
"""

from __future__ import annotations

import os
import struct
import tracemalloc

import pytest

from aeroreview.measure import MeasureError, load_surface, measure
from conftest import run_cli


def refused(path, needle):
    run = run_cli("measure", path)
    assert run.code == 2 and "internal error" not in run.err and "Traceback" not in run.err, run.err
    assert str(path) in run.err and needle in run.err, run.err


def test_csv_field_over_the_csv_limit(tmp_path):
    path = tmp_path / "profile.csv"
    path.write_text("x,z\n0,0\n1," + "9" * 140_000 + "\n2,1\n3,0\n")
    refused(path, "profile.csv:3: not a readable CSV row")


def test_csv_number_too_large(tmp_path):
    path = tmp_path / "profile.csv"
    path.write_text("x,z\n0,0\n1," + "9" * 100_000 + "\n2,1\n3,0\n")
    refused(path, "not finite")


def test_csv_unreadable_row(tmp_path):
    path = tmp_path / "profile.csv"
    path.write_text('x,z\n0,0\n1,"2\n')
    refused(path, "")


def test_profile_with_equal_x(tmp_path):
    path = tmp_path / "profile.csv"
    path.write_text("x,z\n" + "".join(f"1.0,{z}\n" for z in (0, 0.5, 1.0, 1.5, 0.2)))
    refused(path, "every point has the same x")


def test_ply_face_index_out_of_range(tmp_path):
    path = tmp_path / "bad.ply"
    path.write_text("ply\nformat ascii 1.0\nelement vertex 3\nproperty float x\nproperty float y\nproperty float z\n"
                    "element face 1\nproperty list uchar int vertex_indices\nend_header\n"
                    "0 0 0\n1 0 0\n0 1 0\n3 0 1 7\n")
    refused(path, "refers to vertex 7")


def test_ply_declaring_more_than_the_file_holds(tmp_path):
    path = tmp_path / "big.ply"
    path.write_bytes(b"ply\nformat binary_little_endian 1.0\nelement vertex 100000000\nproperty float x\n"
                     b"property float y\nproperty float z\nend_header\n" + b"\0" * 1000)
    refused(path, "header declares at least 1,200,000,000 bytes")


def test_sparse_stl_claiming_1e8_triangles_is_refused_before_reading(tmp_path):
    path = tmp_path / "sparse.stl"
    with path.open("wb") as stream:
        stream.write(b"\0" * 80 + struct.pack("<I", 100_000_000))
        stream.truncate(200_000_000)  # sparse: takes no disk, claims 5 GB of triangles
    tracemalloc.start()
    with pytest.raises(MeasureError, match="header declares at least 5,000,000,084 bytes"):
        load_surface(path)
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    assert peak < 10_000_000  # refused from the header, not after allocating


def test_binary_stl_with_a_consistent_count_still_loads(tmp_path):
    path = tmp_path / "box.stl"
    import trimesh

    trimesh.creation.box((4.0, 1.8, 1.4)).export(path)
    assert measure(load_surface(path, units="m")).length == pytest.approx(4.0)


def test_oversize_file_is_refused(tmp_path, monkeypatch):
    monkeypatch.setattr("aeroreview.surfacefile.MAX_SURFACE_BYTES", 1000)
    path = tmp_path / "big.obj"
    path.write_text("v 0 0 0\n" * 200)
    with pytest.raises(MeasureError, match="over the limit of 1,000"):
        load_surface(path)
    assert os.path.getsize(path) > 1000
