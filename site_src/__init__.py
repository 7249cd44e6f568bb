"""The knowledge base's hand-written pages (MkDocs docs_dir), installed so `aeroreview init` can copy them."""
