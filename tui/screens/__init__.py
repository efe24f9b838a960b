"""The app's screens, one file each."""
