import numpy as np
from scipy.optimize import curve_fit
from scipy.stats import f as fdist
np.set_printoptions(precision=17)
def stats(r, k):
    m=len(r); chi2=float((r**2).sum())
    return chi2, m*np.log(chi2/m)+2*k, m*np.log(chi2/m)+k*np.log(m)
i=np.arange(80); t=2+4.0*i
y=0.5+0.3*np.exp(-(t/60)**2)+0.004*np.sin(5*i)
def echo(t,s0,a,t2,n): return s0+a*np.exp(-(t/t2)**n)
kw=dict(method="lm",ftol=1e-14,xtol=1e-14,gtol=1e-14)
res={}
p,_=curve_fit(echo,t,y,p0=[0.5,0.3,60,2],**kw); res['free']=(p,stats(y-echo(t,*p),4))
for nfix in (1,2):
    f=lambda t,s0,a,t2: echo(t,s0,a,t2,nfix)
    p,_=curve_fit(f,t,y,p0=[0.5,0.3,60],**kw); res[f'n{nfix}']=(p,stats(y-f(t,*p),3))
for k,(p,s) in res.items(): print(k, repr(p.tolist()), repr([float(v) for v in s]))
c2f=res['free'][1][0]
for nfix in (1,2):
    c2=res[f'n{nfix}'][1][0]; F=(c2-c2f)/1/(c2f/(80-4)); print('F', nfix, repr(F), repr(float(fdist.sf(F,1,76))))
# relaxation
j=np.arange(30); x=0.05*1.25**j
yy=np.array([float(f"{v:.5f}") for v in 0.7+0.3*np.exp(-x/4)+0.002*np.sin(7*j+1)])
def rel(t,s0,a,t1): return s0+a*np.exp(-t/t1)
def rels(t,s0,a,t1,n): return s0+a*np.exp(-(t/t1)**n)
p1,_=curve_fit(rel,x,yy,p0=[0.7,0.3,4],**kw); s1=stats(yy-rel(x,*p1),3)
p2,_=curve_fit(rels,x,yy,p0=[0.7,0.3,4,1],**kw); s2=stats(yy-rels(x,*p2),4)
print('rel', repr(p1.tolist()), repr([float(v) for v in s1]))
print('rels', repr(p2.tolist()), repr([float(v) for v in s2]))
F=(s1[0]-s2[0])/1/(s2[0]/26); print('F rel', repr(F), repr(float(fdist.sf(F,1,26))))


# The two T1 cases of the test: a decay stretched with n = 0.975 and with n = 0.96.
def t1_case(ntrue):
    j = np.arange(30)
    x = 0.05 * 1.25**j
    yy = np.array([float(f"{v:.5f}") for v in 0.7 + 0.3 * np.exp(-((x / 4) ** ntrue)) + 0.002 * np.sin(7 * j + 1)])
    p1, _ = curve_fit(rel, x, yy, p0=[0.7, 0.3, 4], **kw)
    s1 = stats(yy - rel(x, *p1), 3)
    p2, _ = curve_fit(rels, x, yy, p0=[0.7, 0.3, 4, 1], **kw)
    s2 = stats(yy - rels(x, *p2), 4)
    F = (s1[0] - s2[0]) / 1 / (s2[0] / 26)
    print(ntrue, "exponential", [float(v) for v in s1], "stretched", [float(v) for v in s2], "F", repr(F), "p", repr(float(fdist.sf(F, 1, 26))))


for ntrue in (0.975, 0.96):
    t1_case(ntrue)
