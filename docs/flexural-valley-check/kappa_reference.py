# Independent NumPy reference for Round 28 (flexural zero valleys): kappa_xx of the one-site sheets of reference.py with one
# relaxation time (10 ps) and thickness 0.3 nm, by the same graded quadrature; group velocities by central differences
# (common practice, no source). Usage: CASE=square2 /usr/bin/python3 kappa_reference.py T...
import sys, os, numpy as np
CASE=os.environ.get('CASE','square2')
sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import reference as R
hbar=R.hbar; kB=R.kB
vecs,a,mass,springs,bendr,kb=R.CASES[CASE]; m=mass*R.amu
tau=10e-12; thick=0.3e-9
B=2*np.pi*np.linalg.inv(vecs).T/a
x,w=R.graded_rule(bps=R.BREAKPOINTS.get(CASE,(0,1/3,0.5,2/3,1)))  # square5: graded towards 1/4 and 3/4 too (Round 30)
def lams(qx,qy):
    Dxx=0*qx; Dyy=0*qx; Dxy=0*qx
    for radius,k in springs:
        for r in R.shell(vecs,radius):
            c=1-np.cos(qx*r[0]*a+qy*r[1]*a); n=r/np.hypot(*r)
            Dxx=Dxx+k/m*c*n[0]**2; Dyy=Dyy+k/m*c*n[1]**2; Dxy=Dxy+k/m*c*n[0]*n[1]
    Dzz=0*qx; seen=[]
    for r in R.shell(vecs,bendr):
        if any(np.allclose(r,-s) for s in seen): continue
        seen.append(r); Dzz=Dzz+4*kb/m*(1-np.cos(qx*r[0]*a+qy*r[1]*a))**2
    mean=(Dxx+Dyy)/2; root=np.sqrt((Dxx-Dyy)**2/4+Dxy**2)
    return [mean-root, mean+root, Dzz]
temps=[float(t) for t in sys.argv[1:]]
tot=np.zeros(len(temps)); ws=0.0
for chunk in np.array_split(np.arange(len(x)),16):
    X,Y=np.meshgrid(x[chunk],x,indexing='ij'); WW=np.outer(w[chunk],w)
    qx=X*B[0,0]+Y*B[1,0]; qy=X*B[0,1]+Y*B[1,1]
    L=lams(qx,qy)
    h=1e-7*np.hypot(*B[0])
    Lp=lams(qx+h,qy); Lm=lams(qx-h,qy)
    for b in range(3):
        om=np.sqrt(np.maximum(L[b],0))
        vx=(np.sqrt(np.maximum(Lp[b],0))-np.sqrt(np.maximum(Lm[b],0)))/(2*h)
        for i,T in enumerate(temps):
            xx=hbar*om/(kB*T)
            with np.errstate(over='ignore',divide='ignore',invalid='ignore'):
                c=np.where((xx<700)&(xx>0), kB*xx*xx*np.exp(-xx)/(-np.expm1(-xx))**2, 0.0)
            tot[i]+=(c*vx*vx*tau*WW).sum()
    ws+=WW.sum()
# Volume per cell: the cell's area |det| a^2 times the thickness (Round 28, zero valleys in conductivity: a^2 alone had the
# triangular cases 2/sqrt(3) low; the square ones are unchanged).
area=abs(np.linalg.det(vecs))*a*a
for T,k in zip(temps, tot/ws/(area*thick)): print('kappa_xx', T, k)
