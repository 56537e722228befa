# NumPy reference for the invented monatomic chain with a folded angle bend.
# Own derivation: the folded angle bend (centre n, ends n+1, n+2 on one ray; E = k d1 d2 dtheta^2 / 2)
# is E = (k/4)|u_n - 2u_{n+1} + u_{n+2}|_perp^2; both ways across the bond -> (k/2) sum_m |D2 u_m|_perp^2,
# The engine pairs every end of shell 1 with every end of shell 2 (README: shells 1 and 2, one end from
# each), so a centre has two folded pairs (+1,+2), (-1,-2) and two straight ones (+1,-2), (-1,+2). For ends
# at p1 a, p2 a (signs e1, e2) the bend's angle change is |d1 - e1 e2 d2| with d_j = (u_j - u_0)_perp / (|p_j| a),
# so each pair adds k |p1| |p2| a^2 |g(q)|^2 to m w_T^2, g = (e^{i q p1 a} - 1)/(|p1| a) - e1 e2 (e^{i q p2 a} - 1)/(|p2| a).
# m w_L^2 = 4 L s^2, s = sin(qa/2); m w_T^2 = 4 T s^2 + bend.
# Heat capacity: Einstein functions summed by Gauss-Legendre over q in [0, pi/a], panels graded toward 0.
import numpy as np, sys
kB=1.380649e-23; hbar=1.054571817e-34; amu=1.66053906660e-27; R=8.314462618
# usage: mono_ref.py [T_N_PER_M]  (default 0.2; 0 makes the transverse branch a pure q^2 branch)
m=20.0
L,k=10.0,2.0
T=float(sys.argv[1]) if len(sys.argv)>1 else 0.2
m*=amu
def cv_mode(w,t):
    x=hbar*w/(kB*t); 
    with np.errstate(over='ignore'):
        xx=np.clip(x,1e-300,700); return np.where(x>700,0.0,np.exp(-xx)*(xx/np.expm1(-xx))**2)
xg,wg=np.polynomial.legendre.leggauss(64)
edges=np.concatenate([[0],np.geomspace(1e-9,1,400)])*np.pi  # qa in [0, pi]
def integ(f):
    s=0.0
    for a,b in zip(edges[:-1],edges[1:]):
        x=0.5*(b-a)*xg+0.5*(a+b); s+=0.5*(b-a)*np.sum(wg*f(x))
    return s/np.pi
def bend(x):
    tot=0.0
    for p1,p2 in [(1,2),(-1,-2),(1,-2),(-1,2)]:
        e=np.sign(p1)*np.sign(p2)
        g=(np.exp(1j*x*p1)-1)/abs(p1)-e*(np.exp(1j*x*p2)-1)/abs(p2)
        tot=tot+k*abs(p1)*abs(p2)*np.abs(g)**2
    return tot
def closed(x):   # the pairs summed: 8 k (1 - cos x)^2 (3 + 2 cos x), written with sin^2(x/2) (no cancellation near 0)
    s2=np.sin(x/2)**2
    return 32*k*s2*s2*(3+2*np.cos(x))
xs=np.linspace(0.05,np.pi,50); assert np.allclose(bend(xs),closed(xs),rtol=1e-9)
print('# transverse frequency at the zone boundary (THz)', np.sqrt((4*T+bend(np.pi))/m)/2/np.pi/1e12, 'beta/c^2 a^2 (q^4 over q^2 coefficient)', (closed(1e-3)/1e-12)/T if T else float('inf'))
for t in [0.05,0.1,0.2,0.5,1,2,5,10,20]:
    def f(x):
        s2=np.sin(x/2)**2
        wT=np.sqrt((4*T*s2+closed(x))/m); wL=np.sqrt(4*L*s2/m)
        return 2*cv_mode(wT,t)+cv_mode(wL,t)
    print(t, R*integ(f))
