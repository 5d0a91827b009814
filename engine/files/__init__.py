"""Reading and writing files, beside the models: system files (TOML) and their facts, the catalog
of shipped and user systems, and atomic writes. Imports the models only.
"""
