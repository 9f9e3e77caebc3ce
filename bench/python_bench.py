#!/usr/bin/python3
"""Times the Python package in process: tiers.read of one file (to compare with tiers-bench's
read of the same file: the binding's cost on top of the C++ reader) and Document.to_pandas of
what was read. Prints one JSON object.

Usage: PYTHONPATH=build/release/python python_bench.py FILE
"""
import json
import sys
import time

import tiers


def main():
    path = sys.argv[1]
    start = time.perf_counter()
    doc = tiers.read(path)
    read_seconds = time.perf_counter() - start
    start = time.perf_counter()
    df = doc.to_pandas()
    pandas_seconds = time.perf_counter() - start
    print(json.dumps({"annotations": len(df), "read_seconds": read_seconds,
                      "to_pandas_seconds": pandas_seconds}))


if __name__ == "__main__":
    main()
