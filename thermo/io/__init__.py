"""File formats: :mod:`.readers` (text / CSV / XLSX → raw table) and :mod:`.writers`
(table + provenance → CSV / JSON / XLSX).  No physics here."""
