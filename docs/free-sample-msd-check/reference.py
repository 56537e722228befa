# References for FreeBoundaryTests: free samples where no atom lost a nearest neighbour (run: python3 reference.py).
# Exact mode sum of a 4-cell free scalar chain of two sites (0 and 0.211 a): independent reference (NumPy).
import numpy as np
hbar=6.62607015e-34/(2*np.pi); kB=1.380649e-23; amu=1.66053906660e-27
N=4; k1,k2,k3=10.0,6.0,3.0; ma,mb=20.0,30.0; T=300.0
n=2*N; K=np.zeros((n,n)); m=np.array([ma,mb]*N)*amu
def spring(i,j,k):
    K[i,i]+=k;K[j,j]+=k;K[i,j]-=k;K[j,i]-=k
for c in range(N):
    spring(2*c,2*c+1,k1)
    if c+1<N:
        spring(2*c+1,2*c+2,k2); spring(2*c,2*c+2,k3)
D=K/np.sqrt(np.outer(m,m)); w2,e=np.linalg.eigh(D)
msd=np.zeros(n)
for kk in range(n):
    if w2[kk] < 1e-8*w2.max(): continue
    w=np.sqrt(w2[kk]); f=hbar/(2*w)/np.tanh(hbar*w/(2*kB*T))
    msd+=f*e[:,kk]**2/m
msd*=1e18
print("zero modes", (w2<1e-8*w2.max()).sum())
print("per atom", msd)
print("site a %.15e site b %.15e"%(msd[0::2].mean(), msd[1::2].mean()))
print("all atoms %.15e"%msd.mean())

# Exact mode sum of an 8-atom free scalar cluster cut by a sphere from a three-site chain (a 0, b 0.211, c 0.55 of a
# cell): a-1 b-1 c-1 a0 b0 c0 a1 b1 in a line, springs a-b 10, b-c 6, c-a(next) 8 N/m; masses 20, 30, 40 amu.

hbar=6.62607015e-34/(2*np.pi); kB=1.380649e-23; amu=1.66053906660e-27; T=300.0
kinds='abcabcab'; m=np.array([{'a':20,'b':30,'c':40}[k] for k in kinds])*amu
ks={'ab':10,'bc':6,'ca':8}
K=np.zeros((8,8))
for i in range(7):
    k=ks[kinds[i]+kinds[i+1]]; j=i+1
    K[i,i]+=k;K[j,j]+=k;K[i,j]-=k;K[j,i]-=k
D=K/np.sqrt(np.outer(m,m)); w2,e=np.linalg.eigh(D)
msd=np.zeros(8)
for kk in range(8):
    if w2[kk]<1e-8*w2.max(): continue
    w=np.sqrt(w2[kk]); f=hbar/(2*w)/np.tanh(hbar*w/(2*kB*T)); msd+=f*e[:,kk]**2/m
msd*=1e18
site={k:np.mean([msd[i] for i in range(8) if kinds[i]==k]) for k in 'abc'}
print({k:'%.15e'%v for k,v in site.items()})
print("all atoms %.15e ; unweighted site mean %.15e"%(msd.mean(), np.mean(list(site.values()))))
