# Independent NumPy reference for Round 29 (valleys): the low-temperature heat capacity of a chain and a simple cubic
# crystal whose couplings skip a cell, so that a second zero valley sits at reduced wave vector 1/2 (chain) or
# (1/2, 1/2, 1/2) (simple cubic), as deep as q = 0's. Common practice, no source; derivations by hand (docs/outside-checks.md,
# Round 29 (valleys)). CODATA 2018 constants.
#   chainbend2:   one site 20 amu, a = 0.3 nm, central spring 10 N/m on shell 1, `angle` bend 2 N/m on shell 2 alone (the
#                 straight pair +-2a). m w_x^2 = 4 L sin^2(q a / 2); m w_y^2 = m w_z^2 = 4 k (1 - cos 2 q a)^2 = 16 k sin^4(q a)
#                 (a straight pair costs (k/2) |u_j + u_k - 2 u_i|_perp^2, README `[[model.bends]]`): zero at q a = 0 and pi.
#   chainspring2: the same site, springs on shell 2 alone (L = 10, T = 1 N/m): m w^2 = 4 K sin^2(q a) per branch, zero at 0 and pi.
#   sc2:          simple cubic, the same site and a, springs on shell 2 alone (the 12 face diagonals, L = 10, T = 1 N/m):
#                 D(q + R) = D(q) with R = (pi, pi, pi) / a (every diagonal's phase is 2 pi), two cone valleys; the Debye
#                 T^3 law C/V = (2 pi^2 / 15) kB^4 T^3 / hbar^3 sum_b <c_b^-3> (average over directions) per valley
#                 (from memory: the low-temperature limit, Ashcroft and Mermin ch. 23, one term per branch).
# Usage: /usr/bin/python3 beyond_sheets.py CASE T...      (1D: graded Gauss-Legendre over the zone; sc2: the T^3 law, valid
#        where T is far below the Debye temperature, i.e. 0.05-0.5 K here)
#        /usr/bin/python3 beyond_sheets.py finite CASE N T...  (1D: the exact mode sum of a periodic chain of N cells, rigid modes out)
import sys, numpy as np
hbar=1.054571817e-34; kB=1.380649e-23; NA=6.02214076e23; amu=1.66053906660e-27
a=0.3e-9; m=20*amu
def einstein(om, T):
    x=hbar*om/(kB*T)
    with np.errstate(over='ignore',divide='ignore',invalid='ignore'):
        return np.where((x<700)&(x>0), x*x*np.exp(-x)/(-np.expm1(-x))**2, 0.0)
def branches1d(case, phi):   # phi = q a
    if case=='chainbend2':
        return [np.sqrt(4*10/m*np.sin(phi/2)**2), np.sqrt(16*2/m*np.sin(phi)**4), np.sqrt(16*2/m*np.sin(phi)**4)]
    if case=='chainspring2':
        return [np.sqrt(4*10/m*np.sin(phi)**2), np.sqrt(4*1/m*np.sin(phi)**2), np.sqrt(4*1/m*np.sin(phi)**2)]
    raise ValueError(case)
def graded(levels=40, nodes=10, bps=(0,0.25,0.5,0.75,1)):
    x,w=np.polynomial.legendre.leggauss(nodes); X=[]; W=[]
    for lo,hi in zip(bps[:-1],bps[1:]):
        h=(hi-lo)/2; edges=[h*2.0**-k for k in range(levels)]+[0.0]
        for a_,b_ in zip(edges[1:],edges[:-1]):
            for end,sgn in ((lo,1),(hi,-1)):
                X.append(end+sgn*(a_+b_)/2+sgn*(b_-a_)/2*x); W.append((b_-a_)/2*w)
    return np.concatenate(X), np.concatenate(W)
def cv1d(case, temps):
    x,w=graded(); phi=2*np.pi*x
    return [sum((einstein(om,T)*w).sum() for om in branches1d(case,phi))*kB*NA for T in temps]
def cv1d_finite(case, n, temps):
    # q = 0 left out (its three rigid modes); a valley floor's zero modes (w^2 at round-off, 1e-12 of the top) add 0, as
    # the engine leaves every zero mode out of its sums
    phi=2*np.pi*np.arange(1,n)/n
    oms=branches1d(case,phi); top=max((om**2).max() for om in oms)
    oms=[np.where(om**2<=1e-12*top,0.0,om) for om in oms]
    return [sum(einstein(om,T).sum() for om in oms)/n*kB*NA for T in temps]
def sc2_speeds(u):
    # Christoffel matrix of the 12 face-diagonal springs: rho c^2 = (1/V) sum_r (q.r)^2 K_r / (2 |q|^2), V = a^3, rho = m / V
    G=np.zeros((3,3))
    for r in [(1,1,0),(1,-1,0),(1,0,1),(1,0,-1),(0,1,1),(0,1,-1)]:
        r=np.array(r,float)*a; e=r/np.linalg.norm(r); K=10*np.outer(e,e)+1*(np.eye(3)-np.outer(e,e))
        G+=K*(u@r)**2          # each of the 6 pairs counted once for +r and -r: 2 x (1/2)
    return np.sqrt(np.linalg.eigvalsh(G/m))
def cv_sc2(temps, valleys=2, nt=96, nphi=192):
    ct,wt=np.polynomial.legendre.leggauss(nt); s=0.0
    for c,wc in zip(ct,wt):
        st=np.sqrt(1-c*c)
        for p in (np.arange(nphi)+0.5)*2*np.pi/nphi:
            u=np.array([st*np.cos(p),st*np.sin(p),c]); s+=wc*(2*np.pi/nphi)*(sc2_speeds(u)**-3.0).sum()
    mean=s/(4*np.pi)
    return [valleys*(2*np.pi**2/15)*kB**4*T**3/hbar**3*mean*a**3*NA for T in temps]
if __name__=='__main__':
    if sys.argv[1]=='finite':
        case=sys.argv[2]; n=int(sys.argv[3]); temps=[float(t) for t in sys.argv[4:]]
        for T,c in zip(temps,cv1d_finite(case,n,temps)): print(case, n, T, repr(c))
    else:
        case=sys.argv[1]; temps=[float(t) for t in sys.argv[2:]]
        vals=cv_sc2(temps) if case=='sc2' else cv1d(case,temps)
        for T,c in zip(temps,vals): print(case, T, repr(c))
