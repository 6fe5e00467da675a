"""Collection at the top of the repository.

``hydro/cut_kernels.py`` has no doctests, and importing it needs numba (optional) and
compiles the kernels, so the doctest run skips it; ``tests/hydro/test_compiled.py``
covers it (and skips without numba).
"""

collect_ignore = ["hydro/cut_kernels.py"]
