# Independent NumPy reference for Round 30 (entropy and zero-point energy): plain Gamma-centred mesh sums of functions
# singular only at q = 0 (a cone |q|, ln |q|), with the q = 0 point given the lattice (Epstein) zeta value, against their
# whole-zone values; and the invented simple cubic crystal of simple_cubic_sums.py (20 amu, 0.3 nm, nearest-neighbour
# springs 10 N/m along, 2 N/m across) on the engine's 8^3 mesh with each branch's cone treated exactly (each branch of
# that model is a quadratic form near q = 0, so its cone is the Euclidean length on a stretched lattice). The zeta values
# by Ewald's split (common practice, from memory); checked on a chain: Z(-1) = 2 zeta(-1) = -1/6, Z'(0) = -ln 2 pi.
# Usage: /usr/bin/python3 gamma_cell_sums.py
import numpy as np, math, itertools
def E1(u):
    if u<1:
        s=-0.5772156649015329-math.log(u); t=1.0
        for k in range(1,60):
            t*=-u/k; s-= t/k
        return s
    # continued fraction (Lentz)
    b=u+1; c=1e300; d=1/b; h=d
    for i in range(1,200):
        a=-i*i; b+=2; d=1/(a*d+b); c=b+a/c; de=c*d; h*=de
        if abs(de-1)<1e-16: break
    return h*math.exp(-u)
def G(a,u):  # upper incomplete gamma for a in {-1/2,0,1/2,1,3/2,2}
    if a==0: return E1(u)
    if a==0.5: return math.sqrt(math.pi)*math.erfc(math.sqrt(u))
    if a==-0.5: return 2*(math.exp(-u)/math.sqrt(u)-math.sqrt(math.pi)*math.erfc(math.sqrt(u)))
    if a==1: return math.exp(-u)
    if a==1.5: return 0.5*G(0.5,u)+math.sqrt(u)*math.exp(-u)
    if a==2: return (1+u)*math.exp(-u)
def pts(B,R):
    d=B.shape[0]; Y=np.linalg.inv(B).T  # rows of B: basis; dual rows Y with B Y^T = I
    rng=[int(math.ceil(R*np.linalg.norm(Y[i]))) for i in range(d)]
    out=[]
    for n in itertools.product(*[range(-r,r+1) for r in rng]):
        if any(n):
            x=np.array(n)@B
            if x@x<=R*R: out.append(x@x)
    return out
def zeta(B):
    d=B.shape[0]; v=abs(np.linalg.det(B)); lam=v**(1/d); Bn=B/lam; Yn=np.linalg.inv(Bn).T
    X=pts(Bn,4.0); Yd=pts(Yn,4.0)
    A=sum(math.sqrt(math.pi*r)*G(-0.5,math.pi*r) for r in X)+sum((math.pi*r)**(-(d+1)/2)*G((d+1)/2,math.pi*r) for r in Yd)-2/(d+1)+2
    zm1=A/(-2*math.pi)
    two=sum(E1(math.pi*r) for r in X)+sum((math.pi*r)**(-d/2)*G(d/2,math.pi*r) for r in Yd)-2/d-0.5772156649015329-math.log(math.pi)
    zp0=two/2
    return lam*zm1, math.log(lam)+zp0
    print(zeta(np.array([[1.0]])), 2*(-1/12), -math.log(2*math.pi))
    print(zeta(np.eye(2)), zeta(np.eye(3)))
    # brute check square lattice: sum_{|n|<=M} |n| w/ smooth? check Z'(0) via trapezoid of ln|q| periodic? skip

print("chain Z(-1), Z'(0):", zeta(np.array([[1.0]])), "closed form", -1/6, -math.log(2*np.pi))
# 1. Periodic cones sqrt(sum 2 - 2 cos q_i) and their logs on N^d meshes: plain, and with the q = 0 value.
for d in (2, 3):
    for N in (8, 16, 32, 64):
        g = 2*np.pi*np.arange(N)/N
        lam = sum(2-2*np.cos(q) for q in np.meshgrid(*([g]*d), indexing='ij'))
        w = np.sqrt(lam); lw = np.log(np.where(lam > 0, lam, 1))/2
        z1, zp = zeta(np.eye(d)*2*np.pi/N)
        print(f"d={d} N={N} cone plain {w.sum()/N**d!r} with q=0 value {(w.sum()-z1)/N**d!r}; log plain {lw.sum()/N**d!r} with {(lw.sum()+zp)/N**d!r}")
# 2. The simple cubic crystal on 8^3 at 60 K, each branch's cone exact (stretched lattices).
hbar=1.054571817e-34; kB=1.380649e-23; NA=6.02214076e23; amu=1.66053906660e-27
a=0.3e-9; m=20*amu; L=10.0; Tk=2.0; N=8; T=60.0
f=(np.arange(N)-N//2)/N
cx,cy,cz=[1-np.cos(2*np.pi*g) for g in np.meshgrid(f,f,f,indexing='ij')]
w=np.concatenate([np.sqrt(np.maximum(l,0)).ravel() for l in (2/m*(L*cx+Tk*cy+Tk*cz), 2/m*(L*cy+Tk*cz+Tk*cx), 2/m*(L*cz+Tk*cx+Tk*cy))])
pos=w[w>0]; h=2*np.pi/(N*a); cone=0.0; log=0.0
for dg in ([L,Tk,Tk],[Tk,L,Tk],[Tk,Tk,L]):
    z1,zp=zeta(np.diag(np.sqrt(np.array(dg)))*h*a/np.sqrt(m)); cone-=z1; log+=zp
x=hbar*pos/(kB*T)
U=((hbar*pos*(0.5+1/np.expm1(x))).sum()+3*kB*T)/N**3*NA
F=kB*T*((x/2+np.log(-np.expm1(-x))).sum()+log+3*math.log(hbar/(kB*T)))/N**3*NA
print("simple cubic 8^3: ZPE plain", hbar/2*pos.sum()/N**3*NA, "with q=0 cones", hbar/2*(pos.sum()+cone)/N**3*NA, "(whole zone: zero_point_sums below)")
print("simple cubic 8^3, 60 K, with q=0 cones: S", (U-F)/T, "F", F, "U", U, "(whole zone: simple_cubic_sums.py 60 128 192, S extrapolated)")
# 3. The whole-zone zero-point energy: shifted meshes 96^3 and 192^3, extrapolated as N^-4.
def zpe(n):
    f=(np.arange(n)+0.5)/n-0.5
    cx,cy,cz=[1-np.cos(2*np.pi*g) for g in np.meshgrid(f,f,f,indexing='ij')]
    return sum((hbar*np.sqrt(l)/2).sum() for l in (2/m*(L*cx+Tk*cy+Tk*cz), 2/m*(L*cy+Tk*cz+Tk*cx), 2/m*(L*cz+Tk*cx+Tk*cy)))*NA/n**3
z96, z192 = zpe(96), zpe(192)
print("simple cubic whole-zone ZPE: 96^3", z96, "192^3", z192, "extrapolated", (16*z192-z96)/15)
