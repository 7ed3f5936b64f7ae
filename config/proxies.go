package config

import (
	"fmt"
	"net/netip"
	"strings"
)

// ParseTrustedProxies reads service.trusted_proxies: IP addresses ("::1",
// "127.0.0.1") and CIDR prefixes ("10.0.0.0/8"). The error names the entry.
func ParseTrustedProxies(list []string) ([]netip.Prefix, error) {
	out := make([]netip.Prefix, 0, len(list))
	for i, v := range list {
		p, err := parseProxy(v)
		if err != nil {
			return nil, fmt.Errorf("service.trusted_proxies[%d]: %q: not an IP address or CIDR prefix (e.g. \"127.0.0.1\" or \"10.0.0.0/8\")", i, v)
		}
		out = append(out, p)
	}
	return out, nil
}

func parseProxy(v string) (netip.Prefix, error) {
	v = strings.TrimSpace(v)
	if strings.Contains(v, "/") {
		p, err := netip.ParsePrefix(v)
		if err != nil {
			return netip.Prefix{}, err
		}
		return p.Masked(), nil
	}
	a, err := netip.ParseAddr(v)
	if err != nil {
		return netip.Prefix{}, err
	}
	a = a.Unmap()
	return netip.PrefixFrom(a, a.BitLen()), nil
}
