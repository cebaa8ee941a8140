"""Readers and writers: everything that touches files lives here."""
