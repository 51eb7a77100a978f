package preview

import (
	"fmt"
	"net"

	"github.com/millrace-workshop/specgen/internal/inputerr"
)

// CheckAddr refuses an address that is not on the loopback
// interface unless public is set.
func CheckAddr(addr string, public bool) error {
	host, _, err := net.SplitHostPort(addr)
	if err != nil {
		return &inputerr.Error{Msg: fmt.Sprintf("-addr %q: %v; write host:port, such as 127.0.0.1:8080", addr, err)}
	}
	if host == "localhost" {
		return nil
	}
	ip := net.ParseIP(host)
	if ip != nil && ip.IsLoopback() {
		return nil
	}
	if !public {
		return &inputerr.Error{Msg: fmt.Sprintf("-addr %q is not a loopback address; the preview would be reachable from other machines. Add -public to allow it", addr)}
	}
	return nil
}
