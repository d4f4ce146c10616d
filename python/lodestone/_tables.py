"""Tables and arrays as the extension takes them (shared by the package's modules)."""

from __future__ import annotations

import os
from typing import Sequence, Tuple, Union

import numpy as np
import pandas as pd

from ._native import LodestoneError

#: A table: a path to a CSV file, or a DataFrame with the same columns.
TableLike = Union[str, "os.PathLike[str]", pd.DataFrame]
ArrayLike = Union[Sequence[float], np.ndarray, float]

def _source(table: TableLike) -> Union[str, Tuple[str, bytes]]:
    """A table for the extension: a path as text, or a DataFrame as CSV bytes with a name."""
    if isinstance(table, pd.DataFrame):
        return ("DataFrame", table.to_csv(index=False).encode("utf-8"))
    if isinstance(table, (str, os.PathLike)):
        return os.fspath(table)
    raise TypeError(f"a table is a path or a pandas DataFrame, not {type(table).__name__}")


def _array(x: ArrayLike, name: str) -> np.ndarray:
    """A contiguous 1-D float64 copy of ``x`` (a scalar becomes one value)."""
    try:
        a = np.asarray(x, dtype=np.float64)
    except (TypeError, ValueError) as e:
        raise LodestoneError(f"{name}: expected numbers ({e})") from None
    return np.ascontiguousarray(a.reshape(-1))
