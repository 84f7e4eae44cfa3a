"""Troubleshooting checklists: one module per checklist, declared with
`calc.checklists.scoreboard.checklist` (causes, checks, cautions, symptoms, readings and the
rules that weigh them). Modules here are found by the registry.
"""
