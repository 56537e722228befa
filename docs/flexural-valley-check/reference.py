# Independent NumPy reference for Round 28 (flexural zero valleys): Cv per mole of atoms of one-site sheets with central
# springs in the plane and a flexural bend on straight pairs of one shell (out-of-plane motion), by a tensor Gauss-Legendre
# quadrature over the reduced zone graded geometrically towards every point of reduced coordinates 0, 1/3, 1/2, 2/3 (where a
# zero valley can sit), so the q^2 valleys are resolved at any temperature (common practice, no source).
# The out-of-plane branch: E = sum over centres and straight pairs (k/2)(z_j + z_k - 2 z_i)^2 (the `flexural` form of a
# straight pair, README), so m omega_z^2 = 4 k sum_pairs (1 - cos q.d)^2 (derived by hand, common practice, no source).
# In-plane: m D = sum over neighbours r of k_r (1 - cos q.r) n n^T (central springs). CODATA 2018 constants.
# Usage: /usr/bin/python3 reference.py CASE T...   (CASE: square1, square1soft, square2, square3, triangular2, triangular3, square5)
import sys, numpy as np
hbar=1.054571817e-34; kB=1.380649e-23; NA=6.02214076e23; amu=1.66053906660e-27
CASES={
 # lattice vectors (units of a), a (m), mass (amu), central springs [(shell radius in a, k)], bend shell radius (a), kb
 'square1': (np.array([[1,0],[0,1]]), 0.4599e-9, 1.0735, [(1,3.1249),(np.sqrt(2),2.3018)], 1.0, 9.9863),
 'square1soft': (np.array([[1,0],[0,1]]), 0.4599e-9, 1.0735, [(1,3.1249),(np.sqrt(2),2.3018)], 1.0, 0.5),
 'square2': (np.array([[1,0],[0,1]]), 0.4599e-9, 1.0735, [(1,3.1249),(np.sqrt(2),2.3018)], np.sqrt(2), 9.9863),
 'square3': (np.array([[1,0],[0,1]]), 0.4599e-9, 1.0735, [(1,3.1249),(np.sqrt(2),2.3018)], 2.0, 9.9863),
 'triangular2': (np.array([[1,0],[0.5,np.sqrt(3)/2]]), 0.3, 12.0, [(1,20.0)], np.sqrt(3), 2.0),
 'triangular3': (np.array([[1,0],[0.5,np.sqrt(3)/2]]), 0.3, 12.0, [(1,20.0)], 2.0, 2.0),
 # Round 29 (valleys): the bend on shell 5 alone, 2 a (1, 1): valleys at every point with x + y and x - y multiples of 1/2,
 # i.e. (1/4, 1/4), (3/4, 1/4), ... as well as (1/2, 0), (0, 1/2), (1/2, 1/2); the rule is graded towards 1/4 and 3/4 too.
 'square5': (np.array([[1,0],[0,1]]), 0.4599e-9, 1.0735, [(1,3.1249),(np.sqrt(2),2.3018)], np.sqrt(8), 9.9863),
}
BREAKPOINTS={'square5': [0,0.25,1/3,0.5,2/3,0.75,1]}
def shell(vecs, radius):
    out=[]
    for i in range(-6,7):
        for j in range(-6,7):
            r=i*vecs[0]+j*vecs[1]
            if abs(np.hypot(*r)-radius)<1e-9: out.append(r)
    return out
def graded_rule(levels=34, nodes=8, bps=(0,1/3,0.5,2/3,1)):
    # nodes and weights on [0, 1] graded towards every breakpoint 0, 1/3, 1/2, 2/3, 1 (geometric panels from each end)
    x,w=np.polynomial.legendre.leggauss(nodes); X=[]; W=[]
    for lo,hi in zip(bps[:-1],bps[1:]):
        mid=(lo+hi)/2; h=(hi-lo)/2
        edges=[h*2.0**-k for k in range(levels)]+[0.0]   # distances from the end, shrinking
        for a_,b_ in zip(edges[1:],edges[:-1]):
            for end,sgn in ((lo,1),(hi,-1)):
                p=end+sgn*(a_+b_)/2+sgn*(b_-a_)/2*x
                X.append(p); W.append((b_-a_)/2*w)
    return np.concatenate(X), np.concatenate(W)
def cv(case, temps):
    vecs,a,mass,springs,bendr,kb=CASES[case]; m=mass*amu
    B=2*np.pi*np.linalg.inv(vecs).T/a           # rows: reciprocal vectors (1/m)
    x,w=graded_rule(bps=BREAKPOINTS.get(case,(0,1/3,0.5,2/3,1)))
    tot=np.zeros(len(temps)); wsum=0.0
    for chunk in np.array_split(np.arange(len(x)), 16):
        X,Y=np.meshgrid(x[chunk],x,indexing='ij'); WW=np.outer(w[chunk],w)
        qx=X*B[0,0]+Y*B[1,0]; qy=X*B[0,1]+Y*B[1,1]
        Dxx=0*qx; Dyy=0*qx; Dxy=0*qx
        for radius,k in springs:
            for r in shell(vecs,radius):
                c=1-np.cos(qx*r[0]*a+qy*r[1]*a); n=r/np.hypot(*r)
                Dxx+=k/m*c*n[0]**2; Dyy+=k/m*c*n[1]**2; Dxy+=k/m*c*n[0]*n[1]
        Dzz=0*qx; seen=[]
        for r in shell(vecs,bendr):
            if any(np.allclose(r,-s) for s in seen): continue
            seen.append(r); Dzz+=4*kb/m*(1-np.cos(qx*r[0]*a+qy*r[1]*a))**2
        mean=(Dxx+Dyy)/2; root=np.sqrt((Dxx-Dyy)**2/4+Dxy**2)
        for lam in (mean-root, mean+root, Dzz):
            om=np.sqrt(np.maximum(lam,0))
            for t,T in enumerate(temps):
                xx=hbar*om/(kB*T)
                with np.errstate(over='ignore',divide='ignore',invalid='ignore'):
                    c=np.where((xx<700)&(xx>0), xx*xx*np.exp(-xx)/(-np.expm1(-xx))**2, np.where(xx==0,1.0,0.0))
                tot[t]+=(c*WW).sum()
        wsum+=WW.sum()
    return tot/wsum*kB*NA
if __name__=='__main__':
    case=sys.argv[1]; temps=[float(t) for t in sys.argv[2:]]
    for T,c in zip(temps,cv(case,temps)): print(case, T, repr(c))
