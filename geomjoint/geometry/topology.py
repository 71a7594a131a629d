"""Walking a B-rep by dimension: the solids, faces, wires and vertices of a shape.

One place for OCCT's explorer loop, so the rest of `geometry/` reads as plain iteration.
"""
from __future__ import annotations

from typing import Iterator

from OCP.TopAbs import TopAbs_EDGE, TopAbs_FACE, TopAbs_SHELL, TopAbs_SOLID, TopAbs_VERTEX, TopAbs_WIRE
from OCP.TopExp import TopExp_Explorer
from OCP.TopoDS import TopoDS, TopoDS_Shape


def _explore(shape: TopoDS_Shape, kind, cast) -> Iterator:
    explorer = TopExp_Explorer(shape, kind)
    while explorer.More():
        yield cast(explorer.Current())
        explorer.Next()


def solids(shape: TopoDS_Shape) -> Iterator:
    """The solids of a shape (a solid itself, or those of a compound), located."""
    return _explore(shape, TopAbs_SOLID, TopoDS.Solid_s)


def faces(shape: TopoDS_Shape) -> Iterator:
    """The faces of a shape, located."""
    return _explore(shape, TopAbs_FACE, TopoDS.Face_s)


def wires(shape: TopoDS_Shape) -> Iterator:
    """The wires of a shape (of a face: its outer and inner boundaries)."""
    return _explore(shape, TopAbs_WIRE, TopoDS.Wire_s)


def vertices(shape: TopoDS_Shape) -> Iterator:
    """The vertices of a shape."""
    return _explore(shape, TopAbs_VERTEX, TopoDS.Vertex_s)


def edges(shape: TopoDS_Shape) -> Iterator:
    """The edges of a shape (shared edges once per face that uses them), located."""
    return _explore(shape, TopAbs_EDGE, TopoDS.Edge_s)


def shells(shape: TopoDS_Shape) -> Iterator:
    """The shells of a shape (those of its solids included), located."""
    return _explore(shape, TopAbs_SHELL, TopoDS.Shell_s)
