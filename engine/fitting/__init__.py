"""Weighted least squares of a system file's free coefficients against its measured facts (scipy,
imported only inside the fit), the fit report and the writer of fitted files. Built on `checking`.
"""
