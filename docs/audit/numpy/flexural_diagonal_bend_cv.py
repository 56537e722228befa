# Independent NumPy check of a flexural case of the first draft of seed 2701 (docs/outside-checks.md, Round 27): Cv per mole of atoms of a square sheet,
# central springs on shells 1, 2 and a flexural bend on the diagonal straight pairs, by brute-force
# Brillouin-zone sums on shifted meshes (common practice). Usage: /usr/bin/python3 flexural_diagonal_bend_cv.py T N...
import sys, numpy as np
hbar=1.054571817e-34; kB=1.380649e-23; NA=6.02214076e23; amu=1.66053906660e-27
a=0.4599e-9; m=1.0735*amu; k1=3.1249; k2=2.3018; kb=9.9863
T=float(sys.argv[1])
def cv_mesh(N, zoom=1.0):
    # mesh over the zone, shifted by half a step; zoom < 1 restricts to a central square (for the plate only)
    f=(np.arange(N)+0.5)/N-0.5
    qx,qy=np.meshgrid(f*2*np.pi/a, f*2*np.pi/a, indexing='ij')
    c1=lambda d: 1-np.cos(qx*d[0]+qy*d[1])
    Dxx=2*k1/m*c1((a,0)); Dyy=2*k1/m*c1((0,a)); Dxy=0*qx
    for d in [(a,a),(a,-a)]:
        n=np.array(d)/np.hypot(*d); c=c1(d)
        Dxx=Dxx+2*k2/m*c*n[0]*n[0]; Dyy=Dyy+2*k2/m*c*n[1]*n[1]; Dxy=Dxy+2*k2/m*c*n[0]*n[1]
    Dzz=kb/m*16*(np.sin((qx*a+qy*a)/2)**4+np.sin((qx*a-qy*a)/2)**4)
    mean=(Dxx+Dyy)/2; root=np.sqrt((Dxx-Dyy)**2/4+Dxy**2)
    tot=0.0
    for lam in (mean-root, mean+root, Dzz):
        w=np.sqrt(np.maximum(lam,0)); x=hbar*w/(kB*T)
        with np.errstate(over='ignore',divide='ignore',invalid='ignore'):
            c=np.where(x<700, x*x*np.exp(-x)/(1-np.exp(-x))**2, 0.0)
        tot+=c.sum()
    return tot/N/N*kB*NA
for N in map(int, sys.argv[2:]):
    print(T, N, repr(cv_mesh(N)))
