# Independent NumPy reference for the audit kit's flexural cases (one-site square or triangular sheet, central shell
# springs without a transverse constant, a flexural bend on the straight pairs of shell 1): Cv per mole of atoms at T by
# brute-force sums over shifted meshes of the reciprocal cell (common practice); the bend's closed form
# m w_z^2 = k sum_d 16 sin^4(q.d/2) over the straight-pair directions d (engine's square-sheet test, derived by hand).
# Usage: /usr/bin/python3 flexural_sheet_cv.py JOB.toml T N...
import sys, tomllib, numpy as np
hbar=1.054571817e-34; kB=1.380649e-23; NA=6.02214076e23; amu=1.66053906660e-27
job=tomllib.load(open(sys.argv[1],'rb')); T=float(sys.argv[2])
M=job['model']; a=M['constant_nm']*1e-9; m=M['sites'][0]['mass_amu']*amu
if M['lattice']=='square':
    A=np.array([[a,0],[0,a]]); shells={1:[(a,0),(0,a)], 2:[(a,a),(a,-a)]}
else:
    s3=np.sqrt(3)/2; a1=np.array([a,0]); a2=np.array([a/2,a*s3])
    A=np.array([a1,a2]); shells={1:[a1,a2,a2-a1], 2:[a1+a2,2*a2-a1,2*a1-a2]}
B=2*np.pi*np.linalg.inv(A).T
springs=[(s['shell'],s['longitudinal_n_per_m']) for s in M['springs']]
bend=M['bends'][0]; assert bend['form']=='flexural' and bend['shell']==1; kb=bend['constant_n_per_m']
def cv(N, chunk=500):
    tot=0.0; f=(np.arange(N)+0.5)/N
    for s in range(0,N,chunk):
        u1,u2=np.meshgrid(f[s:s+chunk],f,indexing='ij')
        qx=u1*B[0,0]+u2*B[1,0]; qy=u1*B[0,1]+u2*B[1,1]
        Dxx=Dyy=Dxy=Dzz=0
        for sh,k in springs:
            for d in shells[sh]:
                d=np.array(d,float); n=d/np.linalg.norm(d); c=1-np.cos(qx*d[0]+qy*d[1])
                Dxx=Dxx+2*k/m*c*n[0]**2; Dyy=Dyy+2*k/m*c*n[1]**2; Dxy=Dxy+2*k/m*c*n[0]*n[1]
        for d in shells[1]:
            Dzz=Dzz+kb/m*16*np.sin((qx*d[0]+qy*d[1])/2)**4
        mean=(Dxx+Dyy)/2; root=np.sqrt((Dxx-Dyy)**2/4+Dxy**2)
        for lam in (mean-root, mean+root, Dzz):
            x=hbar*np.sqrt(np.maximum(lam,0))/(kB*T)
            with np.errstate(over='ignore',divide='ignore',invalid='ignore'):
                c=np.where((x<700)&(x>0), x*x*np.exp(-x)/(1-np.exp(-x))**2, 0.0)
            tot+=c.sum()
    return tot/N/N*kB*NA
for N in map(int, sys.argv[3:]):
    print(T, N, repr(cv(N)))
