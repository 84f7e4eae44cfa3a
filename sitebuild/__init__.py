"""Build-time helpers of build.py: content loading, icons, the local static server."""
