"""Applications over the core: command line (`cli`), calculation records (`calc_records`), batches (`batch`),
the explorer (`explorer`) and the workbook-saving extension."""
