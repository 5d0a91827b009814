"""The explorer's screens: the main explorer, help, and the system picker."""
