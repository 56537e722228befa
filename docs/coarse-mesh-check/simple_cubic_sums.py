# Independent NumPy reference for Round 29 (coarse meshes): U, Cv, S, F per mole of atoms of an invented one-site simple
# cubic crystal (a = 0.3 nm, 20 amu, nearest-neighbour springs longitudinal 10 N/m, transverse 2 N/m, 3d motion) by
# brute-force sums over shifted meshes of the Brillouin zone (common practice, no source). For nearest neighbours D(q)
# is diagonal: m D_xx = 2 [L (1 - cos q_x a) + T (1 - cos q_y a) + T (1 - cos q_z a)], and so on by symmetry (derived by
# hand from the pair tensor K = L e e^T + T (1 - e e^T)). Usage: /usr/bin/python3 simple_cubic_sums.py T N...
import sys, numpy as np
hbar=1.054571817e-34; kB=1.380649e-23; NA=6.02214076e23; amu=1.66053906660e-27
a=0.3e-9; m=20*amu; L=10.0; Tk=2.0
T=float(sys.argv[1])
def sums(N):
    f=(np.arange(N)+0.5)/N-0.5
    cx,cy,cz=[1-np.cos(2*np.pi*g) for g in np.meshgrid(f,f,f,indexing='ij')]
    U=Cv=S=0.0
    for lam in (2/m*(L*cx+Tk*cy+Tk*cz), 2/m*(L*cy+Tk*cz+Tk*cx), 2/m*(L*cz+Tk*cx+Tk*cy)):
        x=hbar*np.sqrt(lam)/(kB*T); n=1/np.expm1(x)
        U+=(hbar*np.sqrt(lam)*(0.5+n)).sum(); Cv+=(kB*x*x*np.exp(x)*n*n).sum(); S+=(kB*(x*n-np.log1p(-np.exp(-x)))).sum()
    k=NA/N**3
    return U*k, Cv*k, S*k, (U-T*S)*k
for N in map(int, sys.argv[2:]):
    U,Cv,S,F=sums(N)
    print(f"T={T} N={N} U={U!r} Cv={Cv!r} S={S!r} F={F!r}")
