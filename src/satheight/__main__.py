"""``python -m satheight ...`` does what the ``satheight`` command does."""

import sys

from .cli import main

if __name__ == "__main__":
    sys.exit(main())
