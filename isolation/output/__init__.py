"""Output: figures (`plots`), tables (`tables`), the report exporters (`report`, `typeset`)."""
