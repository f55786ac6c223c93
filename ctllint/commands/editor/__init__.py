"""The language server that ``ctllint lsp`` runs: ``server`` speaks the protocol (pygls), ``editing`` is the protocol-free part.

Part of the commands stage: may import every stage.
"""
