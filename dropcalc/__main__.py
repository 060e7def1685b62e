"""``python -m dropcalc``: the same as the ``dropcalc`` command."""

from dropcalc.cli import main

main()
