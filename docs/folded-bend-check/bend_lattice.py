# NumPy reference for invented one-site square sheets and simple cubic crystals (3d motion) with nearest-neighbour
# springs (L, T) and an angle bend whose ends come from shell 1 (a) and the shell at 2a along the axes (square: 3,
# simple cubic: 4), so folded (0 deg), straight (180 deg) and right-angle pairs. Own derivation (common practice,
# no source): E = k d1 d2 (d theta)^2 / 2; for theta0 = 0 or pi the angle change is |t1 -+ t2| with the tilts
# t_j = P (u_j - u_0) / d_j (P = I - n n^T); for theta0 = 90 deg, d theta = -(n2.t1 + n1.t2) / sin theta0.
# D(q) m = sum over bonds K (1 - cos q.r) + sum over pairs k d1 d2 M(q)^H M(q), M = A1 (e^{iq.r1} - 1) + A2 (e^{iq.r2} - 1).
# Usage: bend_lattice.py square|sc  lowT|mesh N  -> Cv (J/(mol K)) per temperature
import numpy as np, sys, itertools
kB=1.380649e-23; hbar=1.054571817e-34; amu=1.66053906660e-27; R=8.314462618
a=0.3e-9; m=20*amu; L,T,k=10.0,0.2,2.0
kind=sys.argv[1]; dim=2 if kind=='square' else 3
axes=[np.eye(3)[i] for i in range(dim)]
shell1=[s*e*a for e in axes for s in (1,-1)]
shellF=[2*r for r in shell1]
I=np.eye(3)
def bond_terms():
    out=[]
    for r in shell1:
        n=r/np.linalg.norm(r); K=L*np.outer(n,n)+T*(I-np.outer(n,n)); out.append((r,K))
    return out
def pair_terms():
    out=[]
    for r1 in shell1:
        for r2 in shellF:
            d1,d2=np.linalg.norm(r1),np.linalg.norm(r2); n1,n2=r1/d1,r2/d2; c=n1@n2
            if abs(abs(c)-1)<1e-9:
                P=I-np.outer(n1,n1); A1=P/d1; A2=-np.sign(c)*P/d2
            else:
                s=np.sqrt(1-c*c)
                A1=-((I-np.outer(n1,n1))@n2)[None,:]/(d1*s); A2=-((I-np.outer(n2,n2))@n1)[None,:]/(d2*s)
            out.append((r1,r2,A1,A2,k*d1*d2))
    return out
BT=bond_terms(); PT=pair_terms()
def omegas(q):   # q: (N,3) 1/m -> (N,3) rad/s
    N=len(q); D=np.zeros((N,3,3),complex)
    for r,K in BT:
        D+=(1-np.cos(q@r))[:,None,None]*K
    for r1,r2,A1,A2,w in PT:
        e1=(np.exp(1j*(q@r1))-1)[:,None,None]; e2=(np.exp(1j*(q@r2))-1)[:,None,None]
        M=e1*A1[None]+e2*A2[None]
        D+=w*np.conj(np.transpose(M,(0,2,1)))@M
    ev=np.linalg.eigvalsh(D/m)
    return np.sqrt(np.clip(ev,0,None))
def cvx(w,t):
    x=hbar*w/(kB*t)
    with np.errstate(over='ignore',invalid='ignore',divide='ignore'):
        xx=np.minimum(x,700); v=np.exp(-xx)*(xx/np.expm1(-xx))**2
    return np.where((x>700)|(x==0),0.0,v)
temps=[0.05,0.1,0.2,0.5,1,2,5,10,20]
b=2*np.pi/a
if sys.argv[2]=='lowT':
    # polar/spherical integration over the inscribed ball |q| < b/2; beyond it the Einstein functions are checked small
    qmax=b/2
    edges=np.concatenate([[0],np.geomspace(1e-7,1,200)])*qmax
    xg,wg=np.polynomial.legendre.leggauss(24)
    if dim==2:
        na=96; ang=(np.arange(na)+0.5)*2*np.pi/na  # trapezoid on a periodic function; 4-fold symmetric
        dirs=np.stack([np.cos(ang),np.sin(ang),0*ang],1); dw=np.full(na,2*np.pi/na)
    else:
        ng=24; xc,wc=np.polynomial.legendre.leggauss(ng); na=48; ph=(np.arange(na)+0.5)*2*np.pi/na
        dirs=np.array([[np.sqrt(1-c*c)*np.cos(p),np.sqrt(1-c*c)*np.sin(p),c] for c in xc for p in ph])
        dw=np.array([wc[i]*2*np.pi/na for i in range(ng) for p in ph])
    rad=[];rw=[]
    for lo,hi in zip(edges[:-1],edges[1:]):
        rad+=list(0.5*(hi-lo)*xg+0.5*(hi+lo)); rw+=list(0.5*(hi-lo)*wg)
    rad=np.array(rad); rw=np.array(rw)
    q=(rad[:,None,None]*dirs[None,:,:]).reshape(-1,3)
    w=np.concatenate([omegas(q[i:i+20000]) for i in range(0,len(q),20000)])
    jac=(rad**(dim-1))[:,None]*rw[:,None]*dw[None,:]
    zone=b**dim
    edge_w=omegas(np.array([d*qmax for d in dirs]))
    for t in temps[:6]:
        c=cvx(w,t).sum(1).reshape(len(rad),len(dirs))
        print(t, R*(c*jac).sum()/zone/1, '# max Cv share of a mode at the ball edge', cvx(edge_w,t).max())
else:
    N=int(sys.argv[3]); g=(np.arange(N)+0.5)/N-0.5  # midpoints: no q = 0
    grids=np.meshgrid(*([g]*dim),indexing='ij'); q=np.stack([x.ravel()*b for x in grids]+[np.zeros(N**dim)]*(3-dim),1)
    acc=np.zeros(len(temps))
    for i in range(0,len(q),50000):
        w=omegas(q[i:i+50000])
        for j,t in enumerate(temps): acc[j]+=cvx(w,t).sum()
    for j,t in enumerate(temps): print(t, R*acc[j]/len(q))
