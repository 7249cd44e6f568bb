"""Allow ``python -m aeroreview``."""

import sys

from aeroreview.cli import main

sys.exit(main())
