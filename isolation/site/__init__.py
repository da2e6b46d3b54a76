"""The site: code spectra (`spectra`) and damping rules (`damping`)."""
