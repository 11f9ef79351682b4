"""`python -m migrate` runs the mrlift command line."""
import sys

from migrate.cli import main

sys.exit(main())
