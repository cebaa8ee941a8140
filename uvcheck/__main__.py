"""``python -m uvcheck`` runs the command line."""

from uvcheck.cli import main

if __name__ == "__main__":  # pragma: no cover - exercised through a subprocess test
    main()
